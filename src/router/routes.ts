// Every route is a lazy view, so each screen's code (data table, charts, Pixi) loads with that screen only.
import type { RouteRecordRaw } from 'vue-router'
import { STAFF } from './roles'

export const routes: RouteRecordRaw[] = [
  { path: '/', name: 'home', component: () => import('@/views/HomeRedirectView.vue') },

  // Signed-out screens
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { public: true, guestOnly: true, title: 'Sign in' },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { public: true, guestOnly: true, title: 'Forgot password' },
  },
  {
    path: '/reset-password/:token?',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { public: true, title: 'Choose a new password' },
  },
  {
    path: '/invitation/:token?',
    alias: ['/invite/:token?', '/accept-invitation/:token?', '/invitations/:token?'],
    name: 'accept-invitation',
    component: () => import('@/views/AcceptInvitationView.vue'),
    meta: { public: true, title: 'Accept invitation' },
  },
  {
    path: '/about',
    name: 'about',
    component: () => import('@/views/AboutView.vue'),
    meta: { public: true, title: 'About' },
  },

  // A learning platform's launch hands over here (code in the fragment); the view signs in and moves on.
  {
    path: '/lti/launch',
    name: 'lti-launch',
    component: () => import('@/views/LtiLaunchView.vue'),
    meta: { public: true, title: 'Opening Slipway' },
  },
  {
    path: '/lti/deep-link/:id',
    name: 'lti-deep-link',
    component: () => import('@/views/LtiDeepLinkView.vue'),
    meta: { roles: STAFF, title: 'Add a Slipway activity' },
  },

  // Any signed-in user
  {
    path: '/profile',
    name: 'profile',
    component: () => import('@/views/ProfileView.vue'),
    meta: { title: 'Profile' },
  },

  // Apprentice
  {
    path: '/learn',
    name: 'apprentice-home',
    component: () => import('@/views/ApprenticeHomeView.vue'),
    meta: { roles: ['apprentice'], title: 'My exercises' },
  },
  {
    path: '/learn/practice',
    name: 'practice',
    component: () => import('@/views/PracticeView.vue'),
    meta: { roles: ['apprentice', ...STAFF], title: 'Free practice' },
  },
  {
    path: '/learn/attempts',
    name: 'attempt-history',
    component: () => import('@/views/AttemptHistoryView.vue'),
    meta: { roles: ['apprentice'], title: 'My attempts' },
  },
  {
    path: '/learn/attempts/:id',
    name: 'attempt-result',
    component: () => import('@/views/AttemptResultView.vue'),
    meta: { roles: ['apprentice'], title: 'Attempt result' },
  },
  {
    path: '/records/commissioning/:id',
    name: 'commissioning-record',
    component: () => import('@/views/CommissioningRecordPrintView.vue'),
    meta: { title: 'Commissioning record' },
  },
  {
    path: '/simulator/:key/:version(\\d+)?',
    name: 'simulator',
    component: () => import('@/views/SimulatorView.vue'),
    meta: { title: 'Simulator', workspace: true },
  },
  {
    path: '/replay/:attemptId',
    name: 'replay',
    component: () => import('@/views/SimulatorView.vue'),
    meta: { title: 'Replay', workspace: true },
  },

  // Instructor (admins may open these too)
  {
    path: '/teach',
    name: 'needs-attention',
    component: () => import('@/views/NeedsAttentionView.vue'),
    meta: { roles: STAFF, title: 'Needs attention' },
  },
  {
    path: '/teach/cohorts',
    name: 'cohorts',
    component: () => import('@/views/CohortsView.vue'),
    meta: { roles: STAFF, title: 'Cohorts' },
  },
  {
    path: '/teach/cohorts/:id',
    name: 'cohort-detail',
    component: () => import('@/views/CohortDetailView.vue'),
    meta: { roles: STAFF, title: 'Cohort' },
  },
  {
    path: '/teach/cohorts/:id/live',
    name: 'live-class',
    component: () => import('@/views/LiveClassView.vue'),
    meta: { roles: STAFF, title: 'Live class' },
  },
  {
    path: '/teach/live/attempts/:id',
    name: 'live-watch',
    component: () => import('@/views/LiveWatchView.vue'),
    meta: { roles: STAFF, title: 'Watching a panel', workspace: true },
  },
  {
    path: '/teach/cohorts/:id/assign',
    name: 'assign-scenario',
    component: () => import('@/views/AssignScenarioView.vue'),
    meta: { roles: STAFF, title: 'Assign a scenario' },
  },
  {
    path: '/teach/assignments/:id',
    name: 'assignment',
    component: () => import('@/views/AssignmentView.vue'),
    meta: { roles: STAFF, title: 'Assignment' },
  },
  {
    path: '/teach/apprentices/:id',
    name: 'apprentice',
    component: () => import('@/views/ApprenticeView.vue'),
    meta: { roles: STAFF, title: 'Apprentice' },
  },
  {
    path: '/teach/gradebook',
    name: 'gradebook',
    component: () => import('@/views/GradebookView.vue'),
    meta: { roles: STAFF, title: 'Gradebook' },
  },
  {
    path: '/teach/attempts/:id',
    name: 'attempt-review',
    component: () => import('@/views/AttemptReviewView.vue'),
    meta: { roles: STAFF, title: 'Attempt review' },
  },
  {
    path: '/scenarios',
    name: 'scenario-library',
    component: () => import('@/views/ScenarioLibraryView.vue'),
    meta: { roles: STAFF, title: 'Scenario library' },
  },
  {
    path: '/scenarios/new',
    name: 'scenario-new',
    component: () => import('@/views/ScenarioEditorView.vue'),
    meta: { roles: STAFF, title: 'New scenario' },
  },
  {
    path: '/scenarios/:id',
    name: 'scenario-detail',
    component: () => import('@/views/ScenarioDetailView.vue'),
    meta: { roles: STAFF, title: 'Scenario' },
  },
  {
    path: '/scenarios/:id/compare',
    name: 'scenario-compare',
    component: () => import('@/views/ScenarioCompareView.vue'),
    meta: { roles: STAFF, title: 'Compare versions' },
  },
  {
    path: '/scenarios/:id/edit',
    name: 'scenario-edit',
    component: () => import('@/views/ScenarioEditorView.vue'),
    meta: { roles: STAFF, title: 'Edit scenario' },
  },
  // A scenario's draft on the panel (#17): one view, three purposes (src/simulator/authoring/).
  {
    path: '/scenarios/:id/draft/set-up',
    name: 'scenario-draft-setup',
    component: () => import('@/views/ScenarioDraftPanelView.vue'),
    meta: { roles: STAFF, title: 'Set up the start', workspace: true },
  },
  {
    path: '/scenarios/:id/draft/try',
    name: 'scenario-draft-try',
    component: () => import('@/views/ScenarioDraftPanelView.vue'),
    meta: { roles: STAFF, title: 'Try the draft', workspace: true },
  },
  {
    path: '/scenarios/:id/draft/reference',
    name: 'scenario-draft-reference',
    component: () => import('@/views/ScenarioDraftPanelView.vue'),
    meta: { roles: STAFF, title: 'Record the reference solution', workspace: true },
  },

  // Admin
  {
    path: '/admin/users',
    name: 'admin-users',
    component: () => import('@/views/AdminUsersView.vue'),
    meta: { roles: ['admin'], title: 'Users and roles' },
  },
  {
    path: '/admin/outbox',
    name: 'admin-outbox',
    component: () => import('@/views/AdminOutboxView.vue'),
    meta: { roles: ['admin'], title: 'Mail outbox' },
  },
  {
    path: '/admin/centre',
    name: 'admin-centre',
    component: () => import('@/views/AdminCentreView.vue'),
    meta: { roles: ['admin'], title: 'Centre settings' },
  },
  {
    path: '/admin/backup',
    name: 'admin-backup',
    component: () => import('@/views/AdminBackupView.vue'),
    meta: { roles: ['admin'], title: 'Database backup' },
  },

  {
    path: '/admin/learning-platforms',
    name: 'admin-lti',
    component: () => import('@/views/AdminLtiView.vue'),
    meta: { roles: ['admin'], title: 'Learning platforms' },
  },

  // Links in e-mails, resolved per role
  { path: '/attempts/:id', name: 'mail-attempt', component: () => import('@/views/MailLinkView.vue') },
  { path: '/assignments/:id', name: 'mail-assignment', component: () => import('@/views/MailLinkView.vue') },

  {
    path: '/forbidden',
    name: 'forbidden',
    component: () => import('@/views/ForbiddenView.vue'),
    meta: { public: true, title: 'Not allowed' },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { public: true, title: 'Not found' },
  },
]
