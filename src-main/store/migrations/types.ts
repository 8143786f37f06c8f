/** One step of the schema. `up` is SQL run inside the migration's transaction. */
export interface Migration {
  version: number;
  name: string;
  up: string;
}
