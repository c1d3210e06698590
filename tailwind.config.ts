/**
 * Kilorung's palette and type. Tailwind v4 reads this through `@config` in app/globals.css;
 * the CSS-first `@theme` block there holds the font. Colours are our own: a slate ground with a
 * copper accent for live parts and a teal accent for results.
 */
const config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: { 50: '#f5f7f8', 100: '#e6eaed', 200: '#c9d1d7', 400: '#7d8b96', 600: '#46545f', 800: '#232c33', 900: '#141a1f' },
        copper: { 100: '#fbe9dc', 400: '#e08a4c', 600: '#b85d1f', 800: '#7a3a10' },
        lagoon: { 100: '#d8f1ef', 400: '#2fa69b', 600: '#1b7c73', 800: '#0f4f49' },
        hazard: { 100: '#fde2e2', 500: '#d93a3a', 700: '#9e1f1f' },
      },
    },
  },
};
export default config;
