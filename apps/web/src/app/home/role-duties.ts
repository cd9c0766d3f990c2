import type { Role } from '@clearbase/contracts';

/** What each role does in the lab, in the words the home page uses. */
export const roleDuties: Readonly<Record<Role, readonly string[]>> = {
  customer: [
    'Order development and scans of your colour negative rolls, with the EI each was shot at.',
    'Follow each order from the lab counter to delivery.',
    'View and download your finished scans, one frame or a whole order at once.',
  ],
  operator: [
    'Receive orders and record development, including push and pull.',
    'Upload raw negative scans for each roll and run the inversion.',
    'Tune a roll’s balance in printer points, its exposure and contrast, then check and deliver it.',
  ],
  manager: [
    'Everything an operator does.',
    'Build and publish stock profiles from calibration rolls.',
    'Look after scanners, prices and staff accounts.',
  ],
  admin: [
    'Everything a lab manager does.',
    'Create users of any role, change roles and disable accounts.',
    'Read the audit log of who changed what, and when.',
  ],
};
