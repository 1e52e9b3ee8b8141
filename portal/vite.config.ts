import { defineConfig } from "vitest/config";
import react from "@vitejs/plugin-react";
import tailwindcss from "@tailwindcss/vite";
import path from "node:path";

export default defineConfig({
  root: import.meta.dirname,
  plugins: [react(), tailwindcss()],
  resolve: { alias: { "@": path.resolve(import.meta.dirname, "src") } },
  worker: { format: "es" },
  // assetsInlineLimit 0: small font subsets would otherwise become data: URLs, which the server's
  // CSP (font-src 'self') blocks.
  build: {
    outDir: "dist",
    emptyOutDir: true,
    sourcemap: false,
    assetsInlineLimit: 0,
    // The server's contracts are plain zod schemas and tables with no side effects, but a bundler
    // cannot know that a top-level `z.object(…)` call is pure: without this, importing one schema
    // through the contracts' index put every contract module into the first load.
    rolldownOptions: {
      treeshake: { moduleSideEffects: (id: string) => !id.includes("/ingest-server/src/contracts/"), manualPureFunctions: ["z"] },
    },
  },
  preview: { host: "127.0.0.1", proxy: { "/api": "http://127.0.0.1:8641" } },
  server: { host: "127.0.0.1", proxy: { "/api": "http://127.0.0.1:8641" } },
  test: {
    name: "portal",
    environment: "jsdom",
    include: ["src/**/*.test.{ts,tsx}"],
    setupFiles: ["./vitest.setup.ts"],
  },
});
