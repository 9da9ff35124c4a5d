import type { Config } from "tailwindcss";

/**
 * Zoneward's palette: a deep estuary teal for the brand, a warm brass accent, and plain
 * signal colours (pass, fail, caution) chosen to stay distinct for colour-blind readers
 * when paired with their icons and words.
 */
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        estuary: {
          50: "#eef7f7",
          100: "#d5ebec",
          200: "#acd6d8",
          300: "#79b9bd",
          400: "#47979d",
          500: "#2b7a81",
          600: "#1d646b",
          700: "#0e5a63",
          800: "#0d434a",
          900: "#0a3237",
        },
        brass: {
          100: "#f8ecd4",
          300: "#e8c27a",
          500: "#c9912e",
          700: "#8d6114",
        },
        ink: {
          50: "#f4f6f5",
          100: "#e7ebea",
          200: "#d9e0dd",
          400: "#8a9593",
          600: "#5b6664",
          800: "#2f3837",
          900: "#1c2423",
        },
        pass: { 50: "#ecf7ef", 600: "#1f7a3d", 700: "#17602f" },
        fail: { 50: "#fcefee", 600: "#b42318", 700: "#912018" },
        caution: { 50: "#fff7e6", 600: "#a15c00", 700: "#7f4900" },
      },
      fontFamily: {
        sans: ['"Source Sans 3"', "system-ui", "sans-serif"],
      },
    },
  },
};

export default config;
