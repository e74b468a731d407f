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
  procedures: { path: '/procedures', href: (search?: string) => (search ? `/procedures?${search}` : '/procedures') },
  coupons: { path: '/coupons', href: (search?: string) => (search ? `/coupons?${search}` : '/coupons') },
  couponNew: {
    path: '/coupons/new',
    href: (prefill?: Record<string, string | undefined>) => {
      const params = new URLSearchParams();
      for (const [key, value] of Object.entries(prefill ?? {})) if (value) params.set(key, value);
      const qs = params.toString();
      return qs ? `/coupons/new?${qs}` : '/coupons/new';
    },
  },
  continuity: { path: '/continuity', href: (search?: string) => (search ? `/continuity?${search}` : '/continuity') },
  lapseWatch: { path: '/lapse-watch', href: () => '/lapse-watch' },
  settings: { path: '/settings', href: () => '/settings' },
  imports: { path: '/imports', href: () => '/imports' },
  account: { path: '/account', href: () => '/account' },
  coupon: { path: '/coupons/:id', href: (id: string) => `/coupons/${encodeURIComponent(id)}` },
  verify: { path: '/verify/:token', href: (token: string) => `/verify/${encodeURIComponent(token)}` },
  apiReference: { path: '/api-reference', href: () => '/api-reference' },
  devMail: { path: '/dev/mail', href: () => '/dev/mail' },
  devMailMessage: { path: '/dev/mail/:id', href: (id: string) => `/dev/mail/${encodeURIComponent(id)}` },
} as const;
