// Tailwind CSS 4 runs as a PostCSS plugin; its configuration is linked from app/globals.css.
const config = {
  plugins: {
    "@tailwindcss/postcss": {},
  },
};

export default config;
