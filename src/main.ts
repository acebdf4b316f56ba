import { createApp } from 'vue';
import { createPinia } from 'pinia';
import '@fontsource/source-sans-3/400.css';
import '@fontsource/source-sans-3/600.css';
import '@fontsource/source-sans-3/700.css';
import '@fontsource/jetbrains-mono/400.css';
import './styles/base.css';
import App from './App.vue';
import { createAppRouter } from './router';

const app = createApp(App);
app.use(createPinia());
app.use(createAppRouter());
app.mount('#app');
