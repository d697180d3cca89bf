// For the TypeORM command line only (migration:generate / migration:create),
// which wants a module whose default export is a DataSource. The app builds
// its own with createDataSource().
import { createDataSource } from "./data-source.js";

export default createDataSource({
  url: process.env.DATABASE_URL ?? "postgres://runwright@127.0.0.1:5544/runwright",
});
