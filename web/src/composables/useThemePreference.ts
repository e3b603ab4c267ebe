import { computed } from 'vue';
import { useTheme } from 'vuetify';

const KEY = 'rollway.theme';
const LIGHT = 'rollwayLight';
const DARK = 'rollwayDark';

/** The saved choice, else the system's preference. */
export function preferredTheme(): string {
  const saved = globalThis.localStorage?.getItem(KEY);
  if (saved === LIGHT || saved === DARK) return saved;
  return globalThis.matchMedia?.('(prefers-color-scheme: dark)').matches ? DARK : LIGHT;
}

/** Light/dark switch, remembered in this browser. */
export function useThemePreference() {
  const theme = useTheme();
  const dark = computed(() => theme.global.current.value.dark);
  function toggle(): void {
    const next = dark.value ? LIGHT : DARK;
    theme.change(next);
    globalThis.localStorage?.setItem(KEY, next);
  }
  return { dark, toggle };
}
