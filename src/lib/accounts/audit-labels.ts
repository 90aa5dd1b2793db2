/** Audit actions in plain words, for the audit page. Unknown actions show as they are stored. */
const auditActionLabels: Record<string, string> = {
  'signin.succeeded': 'Signed in',
  'signin.failed': 'Sign-in refused (wrong password)',
  'signin.throttled': 'Sign-in blocked after repeated failures',
  'signin.link_sent': 'Sign-in link sent',
  signout: 'Signed out',
  'sessions.ended': 'Signed out everywhere',
  'password.reset_requested': 'Password reset asked for',
  'password.reset': 'Password changed with a reset link',
  'invitation.created': 'Invitation sent',
  'invitation.accepted': 'Invitation accepted',
  'invitation.revoked': 'Invitation withdrawn',
  'member.role_changed': 'Role changed',
  'member.removed': 'Removed from the company',
  'device_token.rotated': 'Device credential replaced',
  'command.sent': 'Command sent to a cylinder',
};

export const auditLabel = (action: string): string => auditActionLabels[action] ?? action;
