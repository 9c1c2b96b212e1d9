/** The one check both new-password forms make before asking the server: the repetition must match. */
export function repeatIssues(newPassword: string, repeat: string): { field: 'repeat'; message: string }[] {
  return repeat === newPassword ? [] : [{ field: 'repeat', message: 'is not the same as the new password' }];
}
