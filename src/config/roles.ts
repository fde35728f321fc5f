import { roles, type Role } from '#shared/schemas/enums.ts';

/** How each role is named on screen. */
export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  engineer: 'Engineer',
  manager: 'Manager',
  finance: 'Finance',
};

export const roleOptions = roles.map((value) => ({ value, label: roleLabels[value] }));
