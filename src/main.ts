import { createApp } from 'vue';
import { createPinia } from 'pinia';
import { Quasar, Notify, Dialog, Loading } from 'quasar';

// Everything is bundled: fonts and icons come from node_modules, never from the internet.
import '@fontsource/noto-sans/400.css';
import '@fontsource/noto-sans/500.css';
import '@fontsource/noto-sans/700.css';
import '@quasar/extras/material-icons/material-icons.css';
import 'quasar/dist/quasar.css';
import './css/app.css';

import App from './App.vue';
import { createAppRouter, followSessionEnd } from './router';
import { brand } from './theme';

const app = createApp(App);
app.use(createPinia());
const router = createAppRouter();
app.use(router);
app.use(Quasar, {
  plugins: { Notify, Dialog, Loading },
  config: {
    brand,
    notify: { position: 'top-right', timeout: 5000, actions: [{ icon: 'close', color: 'white', 'aria-label': 'Dismiss' }] },
    loading: { delay: 300 },
  },
});
followSessionEnd(router);
app.mount('#q-app');
