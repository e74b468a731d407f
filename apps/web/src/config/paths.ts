// Every route of the web app in one place: `path` for the router, `title` for the browser tab (set on
// every navigation by app/page-title.ts), `href()` for links.
export const paths = {
  signIn: {
    path: '/sign-in',
    title: 'Sign in',
    href: (redirectTo?: string) =>
      redirectTo && redirectTo !== '/' ? `/sign-in?redirect=${encodeURIComponent(redirectTo)}` : '/sign-in',
  },
  setPassword: {
    path: '/set-password',
    title: 'Set your password',
    href: (token: string) => `/set-password?token=${encodeURIComponent(token)}`,
  },
  forgotPassword: { path: '/forgot-password', title: 'Reset your password', href: () => '/forgot-password' },
  overview: { path: '/', title: 'Overview', href: () => '/' },
  myQualifications: {
    path: '/my-qualifications',
    title: 'My qualifications',
    href: () => '/my-qualifications',
  },
  welders: {
    path: '/welders',
    title: 'Welders',
    href: (search?: string) => (search ? `/welders?${search}` : '/welders'),
  },
  welder: {
    path: '/welders/:id',
    title: 'Welder file',
    href: (id: string) => `/welders/${encodeURIComponent(id)}`,
  },
  shops: { path: '/shops', title: 'Shops', href: () => '/shops' },
  people: { path: '/people', title: 'People', href: () => '/people' },
  audit: { path: '/audit', title: 'Audit trail', href: () => '/audit' },
  procedures: {
    path: '/procedures',
    title: 'Procedures',
    href: (search?: string) => (search ? `/procedures?${search}` : '/procedures'),
  },
  coupons: {
    path: '/coupons',
    title: 'Coupons',
    href: (search?: string) => (search ? `/coupons?${search}` : '/coupons'),
  },
  couponNew: {
    path: '/coupons/new',
    title: 'Record a coupon',
    href: (prefill?: Record<string, string | undefined>) => {
      const params = new URLSearchParams();
      for (const [key, value] of Object.entries(prefill ?? {})) if (value) params.set(key, value);
      const qs = params.toString();
      return qs ? `/coupons/new?${qs}` : '/coupons/new';
    },
  },
  continuity: {
    path: '/continuity',
    title: 'Continuity log',
    href: (search?: string) => (search ? `/continuity?${search}` : '/continuity'),
  },
  welds: {
    path: '/welds',
    title: 'Weld log',
    href: (search?: string) => (search ? `/welds?${search}` : '/welds'),
  },
  weld: {
    path: '/welds/:id',
    title: 'Weld',
    href: (id: string) => `/welds/${encodeURIComponent(id)}`,
  },
  crewFinder: {
    path: '/crew-finder',
    title: 'Crew finder',
    href: (search?: string) => (search ? `/crew-finder?${search}` : '/crew-finder'),
  },
  lapseWatch: { path: '/lapse-watch', title: 'Lapse watch', href: () => '/lapse-watch' },
  settings: { path: '/settings', title: 'Settings', href: () => '/settings' },
  imports: { path: '/imports', title: 'Import', href: () => '/imports' },
  apiTokens: { path: '/api-tokens', title: 'API tokens', href: () => '/api-tokens' },
  reports: { path: '/reports', title: 'Reports', href: () => '/reports' },
  account: { path: '/account', title: 'Your account', href: () => '/account' },
  coupon: {
    path: '/coupons/:id',
    title: 'Coupon',
    href: (id: string) => `/coupons/${encodeURIComponent(id)}`,
  },
  verify: {
    path: '/verify/:token',
    title: 'Qualification check',
    href: (token: string) => `/verify/${encodeURIComponent(token)}`,
  },
  apiReference: { path: '/api-reference', title: 'API reference', href: () => '/api-reference' },
  devMail: { path: '/dev/mail', title: 'Outgoing mail', href: () => '/dev/mail' },
  devMailMessage: {
    path: '/dev/mail/:id',
    title: 'Mail message',
    href: (id: string) => `/dev/mail/${encodeURIComponent(id)}`,
  },
} as const;
