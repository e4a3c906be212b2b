import type { RouteRecordRaw } from 'vue-router';

/** Every page of the app. Views are loaded lazily, one chunk per page. */
export const routes: RouteRecordRaw[] = [
  // `/` sends each signed-in person to their role's home (decided in the guard, once the session
  // is known); a visitor who is not signed in sees the public landing page.
  {
    path: '/',
    name: 'root',
    component: () => import('@/views/public/LandingView.vue'),
    meta: { standalone: true, title: 'Drive certification for odometry robots' },
  },

  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/public/SignInView.vue'),
    meta: { public: true, guestOnly: true, title: 'Sign in' },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/public/ForgotPasswordView.vue'),
    meta: { public: true, title: 'Forgotten password' },
  },
  {
    path: '/reset-password',
    name: 'reset-password',
    component: () => import('@/views/public/ResetPasswordView.vue'),
    meta: { public: true, title: 'Choose a password' },
  },
  {
    path: '/signup',
    name: 'employer-signup',
    component: () => import('@/views/public/EmployerSignupView.vue'),
    meta: { public: true, guestOnly: true, title: 'Employer sign-up' },
  },
  {
    path: '/confirm-email',
    name: 'confirm-email',
    component: () => import('@/views/public/ConfirmEmailView.vue'),
    meta: { public: true, title: 'Confirm your e-mail' },
  },

  {
    path: '/admin',
    name: 'admin-home',
    component: () => import('@/views/home/AdminHomeView.vue'),
    meta: { roles: ['admin'], title: 'Administrator home' },
  },
  {
    path: '/admin/users',
    name: 'admin-users',
    component: () => import('@/views/admin/UsersView.vue'),
    meta: { roles: ['admin'], title: 'Users' },
  },
  {
    path: '/admin/orders',
    name: 'admin-orders',
    component: () => import('@/views/admin/OrdersView.vue'),
    meta: { roles: ['admin'], title: 'Seat orders' },
  },
  {
    path: '/admin/pricing',
    name: 'admin-pricing',
    component: () => import('@/views/admin/PricingView.vue'),
    meta: { roles: ['admin'], title: 'Seat pricing' },
  },
  {
    path: '/admin/mail',
    name: 'admin-mail',
    component: () => import('@/views/admin/MailView.vue'),
    meta: { roles: ['admin'], title: 'Mail sink' },
  },
  {
    path: '/employer',
    name: 'employer-home',
    component: () => import('@/views/home/EmployerHomeView.vue'),
    meta: { roles: ['employer'], title: 'Employer home' },
  },
  {
    path: '/employer/enrol',
    name: 'employer-enrol',
    component: () => import('@/views/employer/EnrolView.vue'),
    meta: { roles: ['employer'], title: 'Enrol operators' },
  },
  {
    path: '/employer/seats',
    name: 'employer-seats',
    component: () => import('@/views/employer/SeatsView.vue'),
    meta: { roles: ['employer'], title: 'Seats' },
  },
  {
    path: '/employer/seats/buy',
    name: 'employer-buy-seats',
    component: () => import('@/views/employer/BuySeatsView.vue'),
    meta: { roles: ['employer'], title: 'Buy seats' },
  },
  {
    path: '/employer/orders/:orderId',
    name: 'employer-order',
    component: () => import('@/views/employer/OrderView.vue'),
    meta: { roles: ['employer'], title: 'Seat order' },
  },
  {
    path: '/employer/organization',
    name: 'employer-organization',
    component: () => import('@/views/employer/OrganizationView.vue'),
    meta: { roles: ['employer'], title: 'Organization profile' },
  },
  {
    path: '/employer/fleet',
    name: 'employer-fleet',
    component: () => import('@/views/employer/FleetProfilesView.vue'),
    meta: { roles: ['employer'], title: 'Fleet calibration' },
  },
  {
    path: '/employer/fleet/new',
    name: 'employer-fleet-new',
    // The plots carry chart.js (through PrimeVue's Chart, loaded lazily with this page).
    component: () => import('@/views/employer/FleetProfileNewView.vue'),
    meta: { roles: ['employer'], title: 'New fleet profile' },
  },
  {
    path: '/employer/fleet/:profileId',
    name: 'employer-fleet-profile',
    component: () => import('@/views/employer/FleetProfileView.vue'),
    meta: { roles: ['employer'], title: 'Fleet profile' },
  },
  {
    path: '/operator',
    name: 'operator-home',
    component: () => import('@/views/home/OperatorHomeView.vue'),
    meta: { roles: ['operator'], title: 'Operator home' },
  },
  {
    path: '/operator/trials',
    name: 'operator-trials',
    component: () => import('@/views/operator/TrialsView.vue'),
    meta: { roles: ['operator'], title: 'Trials' },
  },
  {
    path: '/operator/trials/:trialId',
    name: 'operator-briefing',
    component: () => import('@/views/operator/TrialBriefingView.vue'),
    meta: { roles: ['operator'], title: 'Briefing' },
  },
  {
    path: '/operator/drives/:attemptId',
    name: 'operator-drive',
    // The console carries konva: it loads with this route only, never with the main bundle.
    component: () => import('@/views/operator/DriveConsoleView.vue'),
    meta: { roles: ['operator'], title: 'Drive console', wide: true },
  },
  {
    path: '/assessor',
    name: 'assessor-home',
    component: () => import('@/views/home/AssessorHomeView.vue'),
    meta: { roles: ['assessor'], title: 'Assessor home' },
  },
  {
    path: '/assessor/reviews',
    name: 'review-queue',
    component: () => import('@/views/assessor/ReviewQueueView.vue'),
    meta: { roles: ['assessor'], title: 'Review queue' },
  },
  {
    path: '/assessor/reviews/:attemptId',
    name: 'review-workspace',
    // The replay carries konva: loaded with this route only.
    component: () => import('@/views/assessor/ReviewWorkspaceView.vue'),
    meta: { roles: ['assessor'], title: 'Review', wide: true },
  },
  {
    path: '/attempts/:attemptId/report',
    name: 'attempt-report',
    // The report carries konva and chart.js: loaded with this route only.
    component: () => import('@/views/report/AttemptReportView.vue'),
    meta: { roles: ['operator', 'employer', 'assessor', 'admin'], title: 'Attempt report' },
  },
  {
    path: '/hr',
    name: 'hr-home',
    component: () => import('@/views/home/HrHomeView.vue'),
    meta: { roles: ['hr'], title: 'HR home' },
  },

  {
    // Public: the QR code on a certificate opens /verify/<number>?s=<signature>.
    path: '/verify/:number?',
    name: 'verify',
    component: () => import('@/views/verify/VerifyView.vue'),
    meta: { public: true, standalone: true, title: 'Verify a credential' },
  },
  {
    path: '/credentials',
    name: 'credentials',
    component: () => import('@/views/credentials/CredentialsView.vue'),
    meta: { roles: ['operator', 'employer', 'hr', 'assessor', 'admin'], title: 'Credentials' },
  },
  {
    path: '/bulk-verification',
    name: 'bulk-verification',
    component: () => import('@/views/hr/BulkVerifyView.vue'),
    meta: { roles: ['hr', 'employer', 'admin'], title: 'Bulk verification' },
  },

  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { public: true, title: 'Page not found' },
  },
];
