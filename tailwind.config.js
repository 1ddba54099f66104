// Beadline's theme: high-contrast colours that survive sunlight at the trench (WCAG AA on white).
/** @type {import('tailwindcss').Config} */
module.exports = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      colors: {
        ink: "#111827",
        brand: { DEFAULT: "#0b4f6c", dark: "#083a50", light: "#e6f1f6" },
        pass: { DEFAULT: "#166534", light: "#dcfce7" },
        fail: { DEFAULT: "#b91c1c", light: "#fee2e2" },
        caution: { DEFAULT: "#92400e", light: "#fef3c7" },
      },
      fontFamily: { sans: ["var(--font-inter)", "system-ui", "sans-serif"] },
      minHeight: { touch: "44px" },
      minWidth: { touch: "44px" },
    },
  },
};
