import '@fontsource/ibm-plex-sans/400.css';
import '@fontsource/ibm-plex-sans/600.css';
import '@fontsource/jetbrains-mono/400.css';
import { createApp } from 'vue';
import App from './App.vue';
import { registerPlugins } from './plugins/index.ts';

const app = createApp(App);
registerPlugins(app);
app.mount('#app');
