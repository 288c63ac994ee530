import { describe, expect, it } from 'vitest'
import { passwordProblem, PASSWORD_MIN_LENGTH } from '../../shared/utils/password'

// Source: Setwell's own sign-in rules (issue 2: at least 10 characters, a short list of common
// passwords refused). Not trade figures.
describe('passwordProblem', () => {
  it.each([
    { password: 'short', context: {}, problem: /at least 10/ },
    { password: '123456789', context: {}, problem: /at least 10/ },
    { password: 'a'.repeat(201), context: {}, problem: /at most 200/ },
    { password: 'password123', context: {}, problem: /first ones guessed/ },
    { password: 'Password 123', context: {}, problem: /first ones guessed/ },
    { password: 'QWERTYUIOP', context: {}, problem: /first ones guessed/ },
    { password: 'abababababab', context: {}, problem: /more than one or two/ },
    { password: 'aaaaaaaaab', context: {}, problem: /more than one or two/ },
    { password: 'jess.marlow@example.com', context: { email: 'Jess.Marlow@example.com' }, problem: /e-mail/ },
    { password: 'jessmarlow1', context: { name: 'Jess Marlow' }, problem: /name/ },
  ])('refuses $password', ({ password, context, problem }) => {
    expect(passwordProblem(password, context)).toMatch(problem)
  })

  it.each([
    { password: 'wet-edge-trowel-42', context: { email: 'jess@example.com', name: 'Jess' } },
    { password: 'a'.repeat(PASSWORD_MIN_LENGTH - 3) + 'bcd', context: {} },
    { password: 'jessmarlow-skims-ceilings', context: { name: 'Jess Marlow' } },
    { password: 'x'.repeat(190) + 'yz12345678', context: {} },
  ])('accepts $password', ({ password, context }) => {
    expect(passwordProblem(password, context)).toBeNull()
  })
})
