import type { Config } from "tailwindcss";

// Tributary's palette (see DEVELOPERS.md, "Look"). Loaded by app/globals.css through @config.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./ui/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        river: { DEFAULT: "#12404f", light: "#1d5a6d" },
        shallows: { DEFAULT: "#2e7d87", pale: "#cfe5e7", mid: "#8fc1c6" },
        silt: "#f3efe6",
        reed: "#6b8f3a",
        ember: "#c8553d",
      },
      fontFamily: {
        sans: ['"Work Sans"', "ui-sans-serif", "system-ui", "sans-serif"],
      },
    },
  },
};

export default config;
