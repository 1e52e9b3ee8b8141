import type { AuthContext } from "../middleware/authenticate";
import type { ValidInput } from "../middleware/validate";

declare global {
  namespace Express {
    interface Request {
      id?: string;
      auth?: AuthContext;
      valid?: ValidInput;
    }
  }
}

export {};
