// Every route of the web app in one place: `path` for the router, `href()` for links.
export const paths = {
  signIn: {
    path: '/sign-in',
    href: (redirectTo?: string) =>
      redirectTo && redirectTo !== '/' ? `/sign-in?redirect=${encodeURIComponent(redirectTo)}` : '/sign-in',
  },
  setPassword: { path: '/set-password', href: (token: string) => `/set-password?token=${encodeURIComponent(token)}` },
  forgotPassword: { path: '/forgot-password', href: () => '/forgot-password' },
  overview: { path: '/', href: () => '/' },
  myQualifications: { path: '/my-qualifications', href: () => '/my-qualifications' },
  welders: { path: '/welders', href: (search?: string) => (search ? `/welders?${search}` : '/welders') },
  welder: { path: '/welders/:id', href: (id: string) => `/welders/${encodeURIComponent(id)}` },
  shops: { path: '/shops', href: () => '/shops' },
  people: { path: '/people', href: () => '/people' },
  audit: { path: '/audit', href: () => '/audit' },
  devMail: { path: '/dev/mail', href: () => '/dev/mail' },
  devMailMessage: { path: '/dev/mail/:id', href: (id: string) => `/dev/mail/${encodeURIComponent(id)}` },
} as const;
