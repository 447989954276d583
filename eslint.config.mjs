import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  // Server-side scripts are not React: names like werift's `useVP8` are not hooks.
  { files: ["scripts/**/*.ts"], rules: { "react-hooks/rules-of-hooks": "off" } },
  { ignores: [".next/**", "node_modules/**", "data/**", "public/**", "db/migrations/**", "next-env.d.ts", "tests/.cache/**"] },
];
export default config;
