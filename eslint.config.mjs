import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

const config = [
  ...nextVitals,
  ...nextTs,
  { ignores: [".next/**", "node_modules/**", "data/**", "public/**", "db/migrations/**", "next-env.d.ts", "tests/.cache/**"] },
];
export default config;
