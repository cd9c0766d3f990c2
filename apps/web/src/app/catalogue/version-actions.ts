import type { ProfileVersionSummary, Role } from '@clearbase/contracts';
import { managerRoles, staffRoles } from '@clearbase/contracts/values';

/** What a role may do with one version on the stock page; the server checks the same roles on every call. */
export interface VersionActions {
  /** Start a new draft from this version's parameters (operators and up, any status). */
  newDraft: boolean;
  /** Open the draft in the profile editor (operators and up, drafts only). */
  editDraft: boolean;
  /** Download the version's profile document (staff). */
  export: boolean;
  /** Retire a published version (managers and admins). */
  retire: boolean;
}

const staff: readonly Role[] = staffRoles;
const managers: readonly Role[] = managerRoles;

/**
 * The actions a role has on a version.
 *
 * @example
 * versionActions({ status: 'published' }, 'operator'); // { newDraft: true, editDraft: false, export: true, retire: false }
 */
export function versionActions(
  version: Pick<ProfileVersionSummary, 'status'>,
  role: Role | null,
): VersionActions {
  const isStaff = role !== null && staff.includes(role);
  return {
    newDraft: isStaff,
    editDraft: isStaff && version.status === 'draft',
    export: isStaff,
    retire: role !== null && managers.includes(role) && version.status === 'published',
  };
}
