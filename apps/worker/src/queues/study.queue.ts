import { Queue, UnrecoverableError, Worker, type Job } from 'bullmq';
import type { Redis } from 'ioredis';
import { STUDY_QUEUE_NAME, studyJobSchema, type StudyJob } from '@plumbline/contracts';
import type { Database } from '@plumbline/db';
import { runStudy, studiesToRecover } from '../studies/study.job.ts';

/** The study queue's consumer; PostgreSQL holds the study's state, so a lost job is re-enqueued at start. */
export function startStudyWorker(
  db: Database,
  options: { connection: Redis; prefix: string; log: (message: string) => void },
) {
  const queue = new Queue<StudyJob>(STUDY_QUEUE_NAME, {
    connection: options.connection,
    prefix: options.prefix,
  });
  const worker = new Worker<StudyJob>(
    STUDY_QUEUE_NAME,
    async (job: Job<StudyJob>) => {
      const payload = studyJobSchema.safeParse(job.data);
      if (!payload.success) throw new UnrecoverableError(`study job ${job.id}: invalid payload`);
      const outcome = await runStudy(db, payload.data.studyId, (p) =>
        job.updateProgress(Math.round(p * 1000) / 1000),
      );
      options.log(`study ${payload.data.studyId}: ${outcome}`);
      return outcome;
    },
    { connection: options.connection, prefix: options.prefix, concurrency: 1, lockDuration: 120_000 },
  );
  worker.on('error', (error) => options.log(`study worker: ${error.message}`));
  return {
    async recover() {
      const ids = await studiesToRecover(db);
      for (const studyId of ids)
        await queue.add(
          'study',
          { studyId },
          { jobId: `study-${studyId}-${Date.now()}`, removeOnComplete: true, removeOnFail: true },
        );
      return ids.length;
    },
    async close() {
      await worker.close();
      await queue.close();
    },
  };
}
