// Beadline's theme: high-contrast colours that survive sunlight at the trench. Text colours
// reach WCAG 2.x 1.4.6 (AAA, 7:1) on white and on their own light backgrounds; touch
// targets are 48 px (WCAG 2.5.5 AAA asks for at least 44 CSS px; 48 leaves room for gloves).
/** @type {import('tailwindcss').Config} */
module.exports = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: "#111827",
        brand: { DEFAULT: "#0b4f6c", dark: "#083a50", light: "#e6f1f6" },
        pass: { DEFAULT: "#14532d", light: "#dcfce7" },
        fail: { DEFAULT: "#8b1c1c", light: "#fee2e2" },
        caution: { DEFAULT: "#78350f", light: "#fef3c7" },
      },
      fontFamily: { sans: ["system-ui", "-apple-system", "Segoe UI", "Roboto", "Helvetica Neue", "Arial", "sans-serif"] },
      minHeight: { touch: "48px" },
      minWidth: { touch: "48px" },
    },
  },
};
