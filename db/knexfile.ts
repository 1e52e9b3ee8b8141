// For the knex CLI (`NODE_OPTIONS=--import=tsx npx knex --knexfile db/knexfile.ts ...`).
import { knexConfig } from "./src/connection";

export default knexConfig();
