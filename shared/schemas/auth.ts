import { z } from 'zod'
import { emailField, nameField, newPasswordField, text } from './common'
import { ROLES } from '../utils/roles'
import { passwordProblem } from '../utils/password'

export const signUpSchema = z.object({
  firmName: nameField('the firm\'s trading name'),
  name: nameField('your name'),
  email: emailField,
  password: newPasswordField,
}).superRefine((v, ctx) => {
  const problem = passwordProblem(v.password, { email: v.email, name: v.name })
  if (problem && !passwordProblem(v.password)) ctx.addIssue({ code: 'custom', path: ['password'], message: problem })
})
export type SignUpInput = z.infer<typeof signUpSchema>

export const signInSchema = z.object({
  email: emailField,
  password: text({ error: 'Enter your password.' }).min(1, { error: 'Enter your password.' }).max(200, { error: 'That password is too long.' }),
})
export type SignInInput = z.infer<typeof signInSchema>

export const inviteSchema = z.object({
  email: emailField,
  role: z.enum(ROLES, { error: 'Choose a role.' }),
})
export type InviteInput = z.infer<typeof inviteSchema>

export const changeRoleSchema = z.object({
  role: z.enum(ROLES, { error: 'Choose a role.' }),
})

/** Accepting an invitation: a new person names themselves and sets a password; someone with an account gives theirs. */
export const acceptInvitationSchema = z.object({
  name: text().trim().max(120, { error: 'Keep it under 120 characters.' }).optional(),
  password: text({ error: 'Enter a password.' }).min(1, { error: 'Enter a password.' }).max(200, { error: 'That password is too long.' }),
})

export const changePasswordSchema = z.object({
  currentPassword: text({ error: 'Enter your current password.' }).min(1, { error: 'Enter your current password.' }).max(200),
  newPassword: newPasswordField,
})

export const switchFirmSchema = z.object({
  firmId: z.uuid({ error: 'Choose a firm.' }),
})

export const tokenParam = z.object({
  token: text().regex(/^[\w-]{20,100}$/, { error: 'Not found.' }),
})
