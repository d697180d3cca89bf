import type { Config } from "tailwindcss";

// Runwright's palette: slate ink for text and chrome, copper for the accent,
// and three status hues (within / near / over limit) that always travel with
// a word or an icon, never alone.
export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: {
          50: "#f4f6f8",
          100: "#e6eaee",
          200: "#cbd3da",
          300: "#a9b5bf",
          400: "#7f8e9b",
          500: "#5d6d7a",
          600: "#465562",
          700: "#35424d",
          800: "#26313a",
          900: "#19222a",
          950: "#10171d",
        },
        copper: {
          50: "#fbf4ee",
          100: "#f5e3d4",
          200: "#eac3a4",
          300: "#dc9d70",
          400: "#cd7d48",
          500: "#b86632",
          600: "#9c5228",
          700: "#7d4122",
          800: "#5f3219",
          900: "#432412",
        },
        within: { 50: "#ecf8f6", 100: "#d2efeb", 500: "#1b8a80", 600: "#147066", 700: "#0f5851" },
        near: { 50: "#fdf6e7", 100: "#f9e9c2", 500: "#c28a0e", 600: "#9d6f08", 700: "#7a5606" },
        over: { 50: "#fbeeeb", 100: "#f4d6d0", 500: "#b5432f", 600: "#963524", 700: "#76291c" },
      },
      fontFamily: {
        sans: ["Inter", "system-ui", "sans-serif"],
      },
    },
  },
} satisfies Config;
