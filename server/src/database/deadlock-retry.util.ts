// MariaDB's answer when two transactions lock each other out (InnoDB picks one to roll back; a Galera
// certification failure looks the same). The rolled-back work is safe to run again from the start.
export const ER_LOCK_DEADLOCK = 1213;
export const ER_LOCK_WAIT_TIMEOUT = 1205;

/** The MariaDB error number behind a Sequelize error, if any. */
export const sqlErrno = (e: unknown): number | undefined => {
  const x = e as { parent?: { errno?: number }; original?: { errno?: number }; errno?: number } | null | undefined;
  return x?.parent?.errno ?? x?.original?.errno ?? x?.errno;
};

export const isDeadlock = (e: unknown) => sqlErrno(e) === ER_LOCK_DEADLOCK;

/** Runs a whole transaction again (up to `attempts` times in all) when the database rolled it back as a deadlock victim. */
export async function retryOnDeadlock<T>(work: () => Promise<T>, attempts = 3): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await work();
    } catch (e) {
      if (!isDeadlock(e) || attempt >= attempts) throw e;
    }
  }
}
