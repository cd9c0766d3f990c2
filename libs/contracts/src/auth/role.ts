import { z } from 'zod';
import { roles } from '../values/roles';

export const roleSchema = z.enum(roles);
