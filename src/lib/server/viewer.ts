import type { Role } from '../../db/schema/companies';

/** Who is asking: the signed-in person and their role in one company. */
export interface Viewer {
  userId: string;
  email: string;
  name: string | null;
  companyId: string;
  companyName: string;
  role: Role;
  /** Householders: the homes they are linked to. Staff: null (every home of the company). */
  homeIds: readonly string[] | null;
}

/** Role names as people read them. */
export const roleLabels: Record<Role, string> = {
  admin: 'Company administrator',
  operator: 'Service desk',
  engineer: 'Field engineer',
  householder: 'Householder',
};
