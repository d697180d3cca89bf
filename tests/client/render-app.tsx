import { render } from "@testing-library/react";
import { createMemoryRouter, RouterProvider } from "react-router-dom";
import { AppProvider } from "../../src/app/provider";
import { routes } from "../../src/app/routes";

/** The whole app (real route table, fresh query cache) at one address; returns the router to read its location. */
export function renderAt(path: string) {
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  render(
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return router;
}
