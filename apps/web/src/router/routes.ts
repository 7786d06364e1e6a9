import type { RouteRecordRaw } from 'vue-router';

/** Every page is its own chunk, loaded the first time it is opened. */
export const routes: RouteRecordRaw[] = [
  { path: '/', redirect: '/projects' },
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { title: 'Sign in', public: true, guestOnly: true },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { title: 'Forgot password', public: true, guestOnly: true },
  },
  {
    path: '/reset/:token',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    props: true,
    meta: { title: 'Choose a new password', public: true },
  },
  {
    path: '/invite/:token',
    name: 'accept-invitation',
    component: () => import('@/views/AcceptInvitationView.vue'),
    props: true,
    meta: { title: 'Join a project', public: true },
  },
  {
    path: '/projects',
    name: 'projects',
    component: () => import('@/views/ProjectsView.vue'),
    meta: { title: 'Projects', minimumRole: 'viewer' },
  },
  {
    path: '/projects/:id',
    name: 'project-detail',
    component: () => import('@/views/ProjectDetailView.vue'),
    props: true,
    meta: { title: 'Project', minimumRole: 'viewer' },
  },
  {
    path: '/studies',
    name: 'studies',
    component: () => import('@/views/StudiesView.vue'),
    meta: { title: 'Studies', minimumRole: 'viewer', perProject: true },
  },
  {
    path: '/studies/new',
    name: 'study-new',
    component: () => import('@/views/StudyEditorView.vue'),
    props: (route) => ({ template: typeof route.query.template === 'string' ? route.query.template : undefined }),
    meta: { title: 'New study', minimumRole: 'viewer', perProject: true },
  },
  {
    path: '/studies/:id',
    name: 'study-editor',
    component: () => import('@/views/StudyEditorView.vue'),
    props: true,
    meta: { title: 'Study', minimumRole: 'viewer' },
  },
  {
    path: '/runs/:id',
    name: 'run',
    component: () => import('@/views/RunView.vue'),
    props: true,
    meta: { title: 'Run', minimumRole: 'viewer' },
  },
  {
    path: '/runs/:id/results',
    name: 'run-results',
    component: () => import('@/views/RunResultsView.vue'),
    props: true,
    meta: { title: 'Results', minimumRole: 'viewer' },
  },
  {
    path: '/runs',
    name: 'runs',
    component: () => import('@/views/RunsView.vue'),
    meta: { title: 'Runs', minimumRole: 'viewer', perProject: true },
  },
  {
    path: '/materials',
    name: 'materials',
    component: () => import('@/views/MaterialsView.vue'),
    meta: { title: 'Materials', minimumRole: 'viewer', perProject: true },
  },
  {
    path: '/test-data',
    name: 'test-data',
    component: () => import('@/views/TestDataView.vue'),
    meta: { title: 'Test data', minimumRole: 'viewer', perProject: true },
  },
  {
    path: '/admin',
    name: 'admin',
    component: () => import('@/views/AdminView.vue'),
    meta: { title: 'Admin', siteAdmin: true },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    meta: { title: 'Page not found', public: true },
  },
];
