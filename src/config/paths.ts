/** Every client path in one place. */
export const paths = {
  signIn: '/signin',
  home: '/',
  users: '/users',
} as const;
