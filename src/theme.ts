/**
 * Cavitrace's own PrimeVue theme: a deep "cavity teal" primary with warm amber accents on cool grey
 * surfaces, set in IBM Plex Sans. Built on PrimeVue's styled-mode preset machinery.
 */
import { definePreset } from '@primeuix/themes'
import Aura from '@primeuix/themes/aura'

export const cavitraceTheme = definePreset(Aura, {
  primitive: {
    borderRadius: { none: '0', xs: '2px', sm: '3px', md: '4px', lg: '6px', xl: '10px' },
  },
  semantic: {
    primary: {
      50: '#eef7f8',
      100: '#d3ebee',
      200: '#a8d6dc',
      300: '#74bbc4',
      400: '#449aa6',
      500: '#277d8a',
      600: '#1c6571',
      700: '#17515b',
      800: '#12343b',
      900: '#0c2428',
      950: '#071518',
    },
    colorScheme: {
      light: {
        surface: {
          0: '#ffffff',
          50: '#f6f7f8',
          100: '#eceef0',
          200: '#dadee2',
          300: '#c1c7cd',
          400: '#98a1aa',
          500: '#727c86',
          600: '#57606a',
          700: '#414850',
          800: '#2b3137',
          900: '#1b1f23',
          950: '#0f1214',
        },
      },
    },
  },
})
