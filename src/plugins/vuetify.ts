import 'vuetify/styles'
import '@/styles/fonts.css'
import { createVuetify, type VuetifyOptions } from 'vuetify'
import { mdi } from 'vuetify/iconsets/mdi-svg'
import { iconAliases } from './icons'

/**
 * Heardwell's own palette: deep teal, warm clay, off-white paper. Every text colour below was
 * checked against the surfaces for WCAG 2.2 AA (≥ 4.5:1): primary 7.3:1 on the background,
 * clay 5.0:1, and secondary text (on-surface at 72 %) 5.7:1 — Vuetify's default 60 % gives 4.0:1,
 * which fails for field labels.
 */
export const vuetifyOptions: VuetifyOptions = {
  theme: {
    defaultTheme: 'heardwell',
    themes: {
      heardwell: {
        dark: false,
        colors: {
          background: '#FAF8F5',
          surface: '#FFFFFF',
          'surface-bright': '#FFFFFF',
          'surface-light': '#F1ECE5',
          'surface-variant': '#33403F',
          'on-surface-variant': '#F4F1EC',
          'on-background': '#1D2B2B',
          'on-surface': '#1D2B2B',
          primary: '#0F5C5C',
          'primary-darken-1': '#0B4747',
          secondary: '#A4552F',
          'secondary-darken-1': '#86441F',
          accent: '#A4552F',
          error: '#B3261E',
          info: '#1F5F8B',
          success: '#2E6B3A',
          warning: '#8A5A00',
        },
        variables: {
          'border-color': '#1D2B2B',
          'medium-emphasis-opacity': 0.72,
          'high-emphasis-opacity': 0.92,
        },
      },
    },
  },
  icons: { defaultSet: 'mdi', aliases: iconAliases, sets: { mdi } },
  defaults: {
    global: { ripple: true },
    VBtn: { variant: 'flat', rounded: 'lg', class: 'text-none', style: 'letter-spacing: normal' },
    VTextField: { variant: 'outlined', density: 'comfortable', color: 'primary' },
    VTextarea: { variant: 'outlined', density: 'comfortable', color: 'primary', autoGrow: true },
    VSelect: { variant: 'outlined', density: 'comfortable', color: 'primary' },
    VCheckbox: { color: 'primary', density: 'comfortable' },
    VCard: { rounded: 'lg', variant: 'flat', border: true },
    VAlert: { variant: 'tonal', density: 'comfortable', rounded: 'lg' },
    VChip: { size: 'small', variant: 'tonal' },
    VDataTable: { density: 'comfortable', hover: true },
    VDataTableServer: { density: 'comfortable', hover: true },
    VList: { density: 'comfortable' },
    VDialog: { maxWidth: 560 },
    VSkeletonLoader: { color: 'transparent' },
  },
}

export const vuetify = createVuetify(vuetifyOptions)
