import 'vuetify/styles';
import { createVuetify } from 'vuetify';
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg';
import { preferredTheme } from '../composables/useThemePreference.ts';

/** Our own palette: deep ink and a warm copper accent, with a calm dark variant. */
export const vuetify = createVuetify({
  icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable' },
    VSelect: { variant: 'outlined', density: 'comfortable' },
    VBtn: { class: 'text-none' },
  },
  theme: {
    defaultTheme: preferredTheme(),
    themes: {
      rollwayLight: {
        dark: false,
        colors: { primary: '#2c4a6b', secondary: '#b5652b', background: '#f6f4ef', surface: '#ffffff', error: '#b3261e', success: '#2f7d4f', warning: '#a66a00', info: '#3b6ea8' },
      },
      rollwayDark: {
        dark: true,
        colors: { primary: '#8fb3d9', secondary: '#e0965c', background: '#15191e', surface: '#1e242b', error: '#f2867e', success: '#6cc28f', warning: '#e2b04a', info: '#86b0e0' },
      },
    },
  },
});
