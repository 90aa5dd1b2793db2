/**
 * zod 4 takes one `error` option for a field's type check; Heatlayer's forms say two things: that
 * nothing was entered, or that what was entered is the wrong kind. This spells both as that option.
 */
export function messages(missing: string, wrong: string = missing): { error: (issue: { input?: unknown }) => string } {
  return { error: (issue) => (issue.input === undefined ? missing : wrong) };
}
