/** Users and roles (admin): list, create, change roles/name/active, send a password reset link. */
export { listUsers, userItem } from './list';
export { createUser, temporaryPassword } from './create';
export { updateUser } from './update';
export { sendPasswordReset } from './reset-link';
