import type { Config } from "tailwindcss";

// Tributary's palette (see DEVELOPERS.md, "Look"). Loaded by app/globals.css through @config.
// Shallows, reed and ember are a shade darker than the design notes' first cut so that text in them
// (and white text on them) reaches WCAG AA's 4.5:1 on both white and silt (tests/e2e/accessibility.test.ts).
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./ui/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        river: { DEFAULT: "#12404f", light: "#1d5a6d" },
        shallows: { DEFAULT: "#2a727b", pale: "#cfe5e7", mid: "#8fc1c6" },
        silt: "#f3efe6",
        reed: "#557330",
        ember: "#b54a34",
      },
      fontFamily: {
        sans: ['"Work Sans"', "ui-sans-serif", "system-ui", "sans-serif"],
      },
    },
  },
};

export default config;
