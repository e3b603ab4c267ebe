import '@fontsource/ibm-plex-sans/400.css';
import '@fontsource/ibm-plex-sans/600.css';
import '@fontsource/jetbrains-mono/400.css';
import { createPinia } from 'pinia';
import { createApp } from 'vue';
import App from './App.vue';
import { vuetify } from './plugins/vuetify.ts';
import { router } from './router/index.ts';

createApp(App).use(createPinia()).use(router).use(vuetify).mount('#app');
