// Role names and labels, safe for both server and browser code.
export { ROLES, ROLE_LABELS, isRole, roleLabel, type Role } from "../../../db/models/roles";
