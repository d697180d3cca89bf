import { DashboardPage } from "../../features/dashboard/components/dashboard-page";

export default function DashboardScreen() {
  return <DashboardPage />;
}
