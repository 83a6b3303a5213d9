/**
 * Who may do what, defined once. The server's `requirePermission(action)` middleware, the client's
 * navigation and its route guards all read this table; nothing else checks a role by name.
 */

/** Roles, from most to least trusted. */
export const roles = ['admin', 'lead', 'experimenter', 'technician', 'viewer'] as const
export type Role = (typeof roles)[number]

/** Named actions. A route or a menu needs exactly one of them. */
export const actions = [
  'lab.read',
  'cavities.write',
  'targets.write',
  'traces.upload',
  'analyses.run',
  'uploads.correct',
  'uploads.correctAny',
  'uploads.restore',
  'notes.write',
  'logbook.write',
  'lenses.write',
  'plans.write',
  'plans.manageAny',
  'cavities.propose',
  'tokens.manageOwn',
  'tokens.manageAll',
  'users.manage',
  'audit.read',
  'outbox.read',
] as const
export type Action = (typeof actions)[number]

/** One sentence per action, shown to admins next to the roles. */
export const actionSummaries: Record<Action, string> = {
  'lab.read': 'See cavities, traces, analyses, history, the logbook and the lens kit.',
  'cavities.write': 'Create, edit and archive cavities.',
  'targets.write': 'Set mode-match and finesse targets and their alerts.',
  'traces.upload': 'Upload oscilloscope traces.',
  'analyses.run': 'Run and re-run analyses.',
  'uploads.correct': 'Delete or move one’s own uploaded traces and exclude their analyses from history, trends and alerts.',
  'uploads.correctAny': 'Delete, move or exclude anyone’s uploads.',
  'uploads.restore': 'Restore a deleted trace within 30 days.',
  'notes.write': 'Write notes on traces and analyses.',
  'logbook.write': 'Write maintenance-log entries with attachments.',
  'lenses.write': 'Edit the lab’s lens kit.',
  'plans.write': 'Save lens plans, and delete one’s own.',
  'plans.manageAny': 'Delete anyone’s lens plans.',
  'cavities.propose': 'Propose a new cavity, which a lead or an admin approves.',
  'tokens.manageOwn': 'Create, list and revoke one’s own API tokens.',
  'tokens.manageAll': 'List and revoke anyone’s API tokens.',
  'users.manage': 'Invite people, change roles, disable accounts.',
  'audit.read': 'Read the audit log of security events.',
  'outbox.read': 'Read the development mail outbox.',
}

const everyone: readonly Action[] = ['lab.read', 'tokens.manageOwn']
// Whoever may upload may undo their own wrong upload.
// An experimenter with a new setup proposes its cavity; a technician who keeps the lens kit saves plans from it.
const experimenterActions: readonly Action[] = [...everyone, 'traces.upload', 'uploads.correct', 'analyses.run', 'notes.write', 'plans.write', 'cavities.propose']
const technicianActions: readonly Action[] = [...everyone, 'traces.upload', 'uploads.correct', 'logbook.write', 'lenses.write', 'plans.write']
// A lead runs the lab's bench work as well as its plans, so it may do what experimenters and technicians do.
const leadActions: readonly Action[] = [...new Set([...experimenterActions, ...technicianActions, 'cavities.write', 'targets.write', 'lenses.write', 'uploads.correctAny', 'plans.manageAny'] as Action[])]

/** The permission table: each role and the actions it may perform. */
export const permissionTable: Readonly<Record<Role, readonly Action[]>> = {
  admin: actions,
  lead: leadActions,
  experimenter: experimenterActions,
  technician: technicianActions,
  viewer: everyone,
}

/** Human labels and one-line descriptions of the roles. */
export const roleLabels: Record<Role, { label: string; summary: string }> = {
  admin: { label: 'Admin', summary: 'People, roles, tokens, the audit log — and everything else.' },
  lead: { label: 'Lead', summary: 'Creates and edits cavities, targets and alerts; sees and compares all; bench work too.' },
  experimenter: { label: 'Experimenter', summary: 'Uploads traces, runs and re-runs analyses, writes notes, saves lens plans, proposes cavities.' },
  technician: { label: 'Technician', summary: 'Keeps the maintenance log with attachments and the lens kit, saves lens plans, uploads traces.' },
  viewer: { label: 'Viewer', summary: 'Reads everything, changes nothing.' },
}

/** May `role` perform `action`? An unknown or missing role may do nothing. */
export function can(role: Role | null | undefined, action: Action): boolean {
  if (!role) return false
  return permissionTable[role]?.includes(action) ?? false
}

/** The actions a role may perform (a copy, safe to hand out). */
export function actionsOf(role: Role): Action[] {
  return [...permissionTable[role]]
}

/** The roles that may perform `action`. */
export function rolesAllowed(action: Action): Role[] {
  return roles.filter((role) => can(role, action))
}
