import type { Config } from "tailwindcss";

// Slipfield palette: slate ground, a deep teal accent ("slip") and a warm amber for tip lines and cautions.
const config: Config = {
  darkMode: "class",
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}", "./scene/**/*.{ts,tsx}"],
  theme: {
    extend: {
      fontFamily: {
        sans: ["var(--font-sans)", "system-ui", "sans-serif"],
        mono: ["var(--font-mono)", "ui-monospace", "monospace"],
      },
      colors: {
        slip: {
          50: "#eefaf8",
          100: "#d5f2ee",
          200: "#aee4dd",
          300: "#7ccfc6",
          400: "#4bb3aa",
          500: "#2f978f",
          600: "#247a75",
          700: "#21625f",
          800: "#1f4f4d",
          900: "#1c4241",
          950: "#0b2627",
        },
        tip: { 400: "#f5a524", 500: "#e08a0b", 600: "#b86a06" },
      },
    },
  },
  plugins: [],
};
export default config;
