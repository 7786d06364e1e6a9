import { createApp } from 'vue';
import { createPinia } from 'pinia';
// Element Plus components are imported where they are used (tree-shaken); its styles once, here.
import 'element-plus/dist/index.css';

// Roboto from the bundled @fontsource files (never a CDN): light for units, regular, medium, bold.
import '@fontsource/roboto/latin-300.css';
import '@fontsource/roboto/latin-400.css';
import '@fontsource/roboto/latin-500.css';
import '@fontsource/roboto/latin-700.css';
import '@fontsource/roboto/latin-ext-400.css';
import '@fontsource/roboto/latin-ext-500.css';

import './styles/tokens.css';
import './styles/element-theme.css';
import './styles/base.css';

import App from './App.vue';
import { router } from './router';
import { setSessionLostHandler } from './api/http';
import { useAuthStore } from './stores/auth';

const app = createApp(App);
app.use(createPinia());
app.use(router);

// A request that finds the session gone sends the user to sign in, and back here afterwards.
setSessionLostHandler(() => {
  const auth = useAuthStore();
  if (!auth.isSignedIn) return;
  auth.clear();
  const current = router.currentRoute.value;
  if (!current.meta.public) void router.push({ name: 'sign-in', query: { redirect: current.fullPath } });
});
app.mount('#app');
