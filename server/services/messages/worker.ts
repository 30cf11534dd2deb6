/** The app's message queue with its handlers: sending an outbox message, and a quote reminder falling due. */
import type { Sequelize } from 'sequelize';
import type { Config } from '../../config';
import { runReminder, sendQueuedMessage } from './events';
import { MessageQueue } from './queue';

export function createMessageQueue(deps: { config: Config; sequelize: Sequelize; databaseUrl: string; pollSeconds?: number }): MessageQueue {
  return new MessageQueue({
    databaseUrl: deps.databaseUrl,
    sequelize: deps.sequelize,
    pollSeconds: deps.pollSeconds ?? deps.config.queuePollSeconds,
    handlers: {
      send: (job) => sendQueuedMessage(deps.config, job.outboxId),
      reminder: async (job) => {
        await runReminder(deps.sequelize, job);
      },
    },
  });
}
