/** Messages to the customer: templates and settings, the events that make messages, the queue, the history. */
export { listCustomerMessages } from './history';
export { messageOnAcceptance, messageOnBooking, piecesOf, runReminder, scheduleQuoteReminders, sendReadyMessage, tellCustomerOfJobEvents } from './events';
export { MessageQueue, runningQueue, QUEUE_SCHEMA, REMINDER_QUEUE, SEND_QUEUE } from './queue';
export {
  currentWorkshopId,
  fillTemplate,
  getMessageSettings,
  listTemplates,
  MESSAGE_SAFETY_NOTE,
  previewTemplate,
  queueCustomerMessage,
  tagOutboxMessage,
  templateOf,
  updateMessageSettings,
  updateTemplate,
} from './templates';
export { createMessageQueue } from './worker';
