/// <reference types="vitest/config" />
import tailwindcss from "@tailwindcss/vite";
import react from "@vitejs/plugin-react";
import { defineConfig } from "vite";

const apiPort = Number(process.env.PORT ?? 3000);

export default defineConfig({
  plugins: [react(), tailwindcss()],
  // assets/ holds source files imported by the client; nothing is copied as-is.
  publicDir: false,
  // The main chunk (React, the router, TanStack Query, zod) is ~440 kB, 136 kB gzipped.
  build: { outDir: "dist/client", emptyOutDir: true, sourcemap: true, chunkSizeWarningLimit: 600 },
  server: {
    host: "127.0.0.1",
    port: Number(process.env.VITE_PORT ?? 5173),
    strictPort: true,
    proxy: { "/api": { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false } },
  },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: "server",
          environment: "node",
          include: ["tests/server/**/*.test.ts", "tests/e2e/**/*.test.ts"],
          globalSetup: ["tests/support/global-setup.ts"],
          // One database for the run: files take turns rather than race each other.
          fileParallelism: false,
          testTimeout: 30000,
          hookTimeout: 60000,
        },
      },
      {
        // Pure code from shared/ (the engine): no database, no client build.
        extends: true,
        test: {
          name: "engine",
          environment: "node",
          include: ["tests/shared/**/*.test.ts"],
          testTimeout: 60000,
        },
      },
      {
        extends: true,
        test: {
          name: "client",
          environment: "jsdom",
          include: ["tests/client/**/*.test.tsx"],
        },
      },
    ],
  },
});
