import { computed, type ComputedRef } from 'vue';
import { useTheme } from 'vuetify';
import { plotInk, type PlotInk } from '../components/plots/palette.ts';

/** Plot colours that follow the app's light or dark theme. */
export function usePlotInk(): ComputedRef<PlotInk> {
  const theme = useTheme();
  return computed(() => plotInk(theme.current.value.dark));
}
