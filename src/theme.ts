import { definePreset } from '@primeuix/themes';
import Aura from '@primeuix/themes/aura';

/**
 * Driftproof's own look, built on Aura's structure.
 *
 * - "Deepwater": a deep blue-green, the brand colour (buttons, links, focus).
 * - "Signal amber": a warm amber kept for caution notices only, so it keeps its meaning.
 * - "Chart paper": cool, slightly green-tinted neutrals for surfaces and text.
 */
export const deepwater = {
  50: '#eef7f6',
  100: '#d4ecea',
  200: '#a9d8d4',
  300: '#76bdb8',
  400: '#449d99',
  500: '#24807e',
  600: '#166967',
  700: '#115655',
  800: '#0f4546',
  900: '#0d393b',
  950: '#062325',
} as const;

export const signalAmber = {
  50: '#fff8eb',
  100: '#fdecc8',
  200: '#fbd68b',
  300: '#f8bb4f',
  400: '#f2a126',
  500: '#dc850c',
  600: '#bb6707',
  700: '#954c0a',
  800: '#793d0f',
  900: '#643310',
  950: '#3a1904',
} as const;

export const chartPaper = {
  0: '#ffffff',
  50: '#f4f7f6',
  100: '#e8eeed',
  200: '#d5dedc',
  300: '#b8c5c3',
  400: '#8e9f9c',
  500: '#697b78',
  600: '#51615e',
  700: '#3e4c4a',
  800: '#2a3533',
  900: '#1a2322',
  950: '#0d1413',
} as const;

/** Severity colours for notices: information in Deepwater, caution in Signal amber. */
const severityTokens = (palette: 'deepwater' | 'caution') => ({
  background: `{${palette}.50}`,
  borderColor: `{${palette}.200}`,
  color: `{${palette}.800}`,
  shadow: `0px 4px 8px 0px color-mix(in srgb, {${palette}.500}, transparent 94%)`,
  closeButton: { hoverBackground: `{${palette}.100}`, focusRing: { color: `{${palette}.700}`, shadow: 'none' } },
});

export const DriftproofPreset = definePreset(Aura, {
  primitive: {
    deepwater,
    caution: signalAmber,
    chartpaper: chartPaper,
  },
  semantic: {
    primary: {
      50: '{deepwater.50}',
      100: '{deepwater.100}',
      200: '{deepwater.200}',
      300: '{deepwater.300}',
      400: '{deepwater.400}',
      500: '{deepwater.500}',
      600: '{deepwater.600}',
      700: '{deepwater.700}',
      800: '{deepwater.800}',
      900: '{deepwater.900}',
      950: '{deepwater.950}',
    },
    focusRing: {
      width: '2px',
      style: 'solid',
      color: '{deepwater.500}',
      offset: '2px',
      shadow: 'none',
    },
    // Aura shows focus on fields by border colour alone; we add a visible ring.
    formField: {
      focusRing: {
        width: '2px',
        style: 'solid',
        color: '{deepwater.400}',
        offset: '1px',
        shadow: 'none',
      },
    },
    colorScheme: {
      light: {
        surface: {
          0: '{chartpaper.0}',
          50: '{chartpaper.50}',
          100: '{chartpaper.100}',
          200: '{chartpaper.200}',
          300: '{chartpaper.300}',
          400: '{chartpaper.400}',
          500: '{chartpaper.500}',
          600: '{chartpaper.600}',
          700: '{chartpaper.700}',
          800: '{chartpaper.800}',
          900: '{chartpaper.900}',
          950: '{chartpaper.950}',
        },
        primary: {
          color: '{deepwater.700}',
          contrastColor: '#ffffff',
          hoverColor: '{deepwater.800}',
          activeColor: '{deepwater.900}',
        },
        highlight: {
          background: '{deepwater.50}',
          focusBackground: '{deepwater.100}',
          color: '{deepwater.800}',
          focusColor: '{deepwater.900}',
        },
        formField: {
          focusBorderColor: '{deepwater.600}',
        },
      },
    },
  },
  components: {
    toast: {
      colorScheme: {
        light: {
          info: { ...severityTokens('deepwater'), detailColor: '{surface.700}' },
          warn: { ...severityTokens('caution'), detailColor: '{surface.700}' },
        },
      },
    },
    message: {
      colorScheme: {
        light: {
          info: {
            ...severityTokens('deepwater'),
            outlined: { color: '{deepwater.700}', borderColor: '{deepwater.700}' },
            simple: { color: '{deepwater.700}' },
          },
          warn: {
            ...severityTokens('caution'),
            outlined: { color: '{caution.800}', borderColor: '{caution.800}' },
            simple: { color: '{caution.800}' },
          },
        },
      },
    },
  },
});

/** Passed to PrimeVue: the dark scheme is only used if we add a switch for it later. */
export const themeConfig = {
  preset: DriftproofPreset,
  options: {
    prefix: 'p',
    darkModeSelector: '.driftproof-dark',
    cssLayer: false,
  },
} as const;
