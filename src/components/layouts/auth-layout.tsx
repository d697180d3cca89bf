import { Outlet } from "react-router-dom";
import logo from "../../../assets/logo.svg";

/** Chrome of the pages used before signing in: the name and mark, and one centred card. */
export function AuthLayout() {
  return (
    <div className="flex min-h-screen flex-col items-center bg-ink-50 px-4 py-10 sm:justify-center">
      <div className="mb-6 flex items-center gap-2">
        <img src={logo} alt="" width={32} height={32} />
        <span className="text-xl font-semibold tracking-tight text-ink-900">Runwright</span>
      </div>
      <main id="main" className="w-full max-w-md rounded-xl border border-ink-100 bg-white p-6 shadow-sm sm:p-8">
        <Outlet />
      </main>
      <p className="mt-6 max-w-md text-center text-xs text-ink-400">Prove the voltage at every load, then price the job.</p>
    </div>
  );
}
