import type { Config } from "tailwindcss";

// Kinarc's palette: a deep teal for actions, warm sand for surfaces, and a clear amber/rose pair for
// flags. Chosen for contrast (WCAG AA on white) rather than to echo any other product.
const config: Config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: { DEFAULT: "#1d2a30", soft: "#45555c", faint: "#6b7a80" },
        tide: { 50: "#eef7f6", 100: "#d5ecea", 200: "#a9d8d3", 500: "#23857c", 600: "#1b6f67", 700: "#155952", 900: "#0b2f2b" },
        sand: { 50: "#fbf8f3", 100: "#f4eee3", 200: "#e8dcc7" },
        flag: { amber: "#b4630c", amberBg: "#fdf1e0", rose: "#b3263e", roseBg: "#fbe9ec" },
      },
      fontFamily: { sans: ["var(--font-body)", "system-ui", "sans-serif"] },
      borderRadius: { card: "0.9rem" },
    },
  },
};
export default config;
