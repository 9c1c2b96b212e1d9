/**
 * Tacklog's colours: a calm neutral base and one accent of our own, a deep "bench teal".
 * Status colours (positive, negative, warning, info) always come with text, never alone.
 * Keep these in step with the custom properties in css/app.css.
 */
export const brand = {
  primary: '#17656a',
  secondary: '#4f5d62',
  accent: '#17656a',
  dark: '#1d2427',
  'dark-page': '#151a1c',
  positive: '#2d7a4b',
  negative: '#b42318',
  info: '#3b6786',
  warning: '#b86a00',
} as const;
