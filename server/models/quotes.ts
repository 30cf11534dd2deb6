import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { PaymentFlag, PaymentStatus, QuoteExtra, QuotePricing, QuoteState } from '@shared/schemas/quotes';
import type { Estimate } from './estimates';

export class Quote extends Model<InferAttributes<Quote>, InferCreationAttributes<Quote>> {
  declare id: CreationOptional<number>;
  declare number: string;
  declare estimateId: ForeignKey<Estimate['id']>;
  declare revisionId: number;
  declare state: CreationOptional<QuoteState>;
  declare message: CreationOptional<string>;
  declare extras: QuoteExtra[];
  declare discountPct: string | number;
  declare depositPct: string | number;
  declare validUntil: string;
  declare pricing: QuotePricing;
  declare total: string;
  declare deposit: string;
  declare currency: string;
  declare recipient: string | null;
  declare tokenHash: string | null;
  declare revoked: CreationOptional<boolean>;
  declare createdBy: number | null;
  declare sentAt: Date | null;
  declare viewedAt: Date | null;
  declare acceptedAt: Date | null;
  declare acceptedName: string | null;
  declare acceptedIp: string | null;
  declare acceptedExtras: string[] | null;
  declare acceptedTotal: string | null;
  declare acceptedDeposit: string | null;
  declare declinedAt: Date | null;
  declare declineReason: string | null;
  declare depositPaidAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare estimate?: NonAttribute<Estimate>;

  static initModel(sequelize: Sequelize): void {
    Quote.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
        revisionId: { type: DataTypes.INTEGER, allowNull: false },
        state: { type: DataTypes.STRING(20), allowNull: false, defaultValue: 'draft' },
        message: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        extras: { type: DataTypes.JSONB, allowNull: false, defaultValue: [] },
        discountPct: { type: DataTypes.DECIMAL(5, 2), allowNull: false, defaultValue: 0 },
        depositPct: { type: DataTypes.DECIMAL(5, 2), allowNull: false },
        validUntil: { type: DataTypes.DATEONLY, allowNull: false },
        pricing: { type: DataTypes.JSONB, allowNull: false },
        total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        deposit: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        recipient: { type: DataTypes.STRING(254), allowNull: true },
        tokenHash: { type: DataTypes.STRING(64), allowNull: true, unique: true },
        revoked: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        viewedAt: { type: DataTypes.DATE, allowNull: true },
        acceptedAt: { type: DataTypes.DATE, allowNull: true },
        acceptedName: { type: DataTypes.STRING(160), allowNull: true },
        acceptedIp: { type: DataTypes.STRING(64), allowNull: true },
        acceptedExtras: { type: DataTypes.JSONB, allowNull: true },
        acceptedTotal: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        acceptedDeposit: { type: DataTypes.DECIMAL(14, 2), allowNull: true },
        declinedAt: { type: DataTypes.DATE, allowNull: true },
        declineReason: { type: DataTypes.STRING(1000), allowNull: true },
        depositPaidAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'quotes', underscored: true },
    );
  }
}

/** One priced estimate revision on a quote; lines sharing an option group are alternatives for one piece. */
export class QuoteLine extends Model<InferAttributes<QuoteLine>, InferCreationAttributes<QuoteLine>> {
  declare id: CreationOptional<number>;
  declare quoteId: number;
  declare position: number;
  declare optionGroup: number;
  declare groupOptional: boolean;
  declare label: string;
  declare recommended: boolean;
  declare estimateId: number;
  declare pieceId: number;
  declare revisionId: number;
  declare pricing: QuotePricing;
  declare total: string;
  declare chosen: boolean | null;
  declare agreed: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    QuoteLine.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        quoteId: { type: DataTypes.INTEGER, allowNull: false },
        position: { type: DataTypes.INTEGER, allowNull: false },
        optionGroup: { type: DataTypes.INTEGER, allowNull: false },
        groupOptional: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        label: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        recommended: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
        estimateId: { type: DataTypes.INTEGER, allowNull: false },
        pieceId: { type: DataTypes.INTEGER, allowNull: false },
        revisionId: { type: DataTypes.INTEGER, allowNull: false },
        pricing: { type: DataTypes.JSONB, allowNull: false },
        total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        chosen: { type: DataTypes.BOOLEAN, allowNull: true },
        agreed: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'quote_lines', underscored: true, updatedAt: false },
    );
  }
}

export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<number>;
  declare quoteId: number | null;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare htmlBody: string;
  declare attachmentName: string | null;
  declare attachment: Buffer | null;
  declare status: CreationOptional<'queued' | 'sending' | 'sent' | 'failed'>;
  declare attempts: CreationOptional<number>;
  declare lastError: string | null;
  declare messageId: string | null;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare sentAt: Date | null;
  /** Messages to the customer (migration 2026.12.06T10.00): whom, which job, which template, when due, which event. */
  declare customerId: CreationOptional<number | null>;
  declare jobId: CreationOptional<number | null>;
  declare kind: CreationOptional<string | null>;
  declare sendAfter: CreationOptional<Date | null>;
  declare dedupeKey: CreationOptional<string | null>;

  static initModel(sequelize: Sequelize): void {
    OutboxMessage.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        quoteId: { type: DataTypes.INTEGER, allowNull: true },
        toAddress: { type: DataTypes.STRING(254), allowNull: false },
        subject: { type: DataTypes.STRING(300), allowNull: false },
        textBody: { type: DataTypes.TEXT, allowNull: false },
        htmlBody: { type: DataTypes.TEXT, allowNull: false },
        attachmentName: { type: DataTypes.STRING(200), allowNull: true },
        attachment: { type: DataTypes.BLOB, allowNull: true },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'queued' },
        attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        lastError: { type: DataTypes.TEXT, allowNull: true },
        messageId: { type: DataTypes.STRING(300), allowNull: true },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        sentAt: { type: DataTypes.DATE, allowNull: true },
        customerId: { type: DataTypes.INTEGER, allowNull: true },
        jobId: { type: DataTypes.INTEGER, allowNull: true },
        kind: { type: DataTypes.STRING(24), allowNull: true },
        sendAfter: { type: DataTypes.DATE, allowNull: true },
        dedupeKey: { type: DataTypes.STRING(120), allowNull: true },
      },
      { sequelize, tableName: 'outbox', underscored: true, updatedAt: false },
    );
  }
}

export class Payment extends Model<InferAttributes<Payment>, InferCreationAttributes<Payment>> {
  declare id: CreationOptional<number>;
  declare quoteId: ForeignKey<Quote['id']>;
  declare providerSessionId: string;
  declare amountMinor: number | string;
  declare currency: string;
  declare status: CreationOptional<PaymentStatus>;
  declare createdAt: CreationOptional<Date>;
  declare paidAt: Date | null;
  declare checkoutUrl: string | null;
  declare expiresAt: Date | null;
  declare paymentIntent: CreationOptional<string | null>;
  declare amountReceivedMinor: CreationOptional<number | string | null>;
  declare flag: CreationOptional<PaymentFlag | null>;
  declare note: CreationOptional<string | null>;
  declare refundId: CreationOptional<string | null>;
  declare refundedAt: CreationOptional<Date | null>;
  declare closedAt: CreationOptional<Date | null>;
  /** What the checkout pays: the deposit, or (after it) the balance. */
  declare purpose: CreationOptional<'deposit' | 'balance'>;
  /** The workshop's account at the provider the checkout was opened on (closing and refunding go to the same one). */
  declare providerAccountId: CreationOptional<string | null>;

  static initModel(sequelize: Sequelize): void {
    Payment.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        providerSessionId: { type: DataTypes.STRING(120), allowNull: false, unique: true },
        amountMinor: { type: DataTypes.BIGINT, allowNull: false },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'pending' },
        createdAt: DataTypes.DATE,
        paidAt: { type: DataTypes.DATE, allowNull: true },
        checkoutUrl: { type: DataTypes.TEXT, allowNull: true },
        expiresAt: { type: DataTypes.DATE, allowNull: true },
        paymentIntent: { type: DataTypes.STRING(120), allowNull: true },
        amountReceivedMinor: { type: DataTypes.BIGINT, allowNull: true },
        flag: { type: DataTypes.STRING(24), allowNull: true },
        note: { type: DataTypes.TEXT, allowNull: true },
        refundId: { type: DataTypes.STRING(120), allowNull: true },
        refundedAt: { type: DataTypes.DATE, allowNull: true },
        closedAt: { type: DataTypes.DATE, allowNull: true },
        purpose: { type: DataTypes.STRING(10), allowNull: false, defaultValue: 'deposit' },
        providerAccountId: { type: DataTypes.STRING(120), allowNull: true },
      },
      { sequelize, tableName: 'payments', underscored: true, updatedAt: false },
    );
  }
}

export class PaymentEvent extends Model<InferAttributes<PaymentEvent>, InferCreationAttributes<PaymentEvent>> {
  declare eventId: string;
  declare type: string;
  declare receivedAt: Date;

  static initModel(sequelize: Sequelize): void {
    PaymentEvent.init(
      {
        eventId: { type: DataTypes.STRING(120), primaryKey: true },
        type: { type: DataTypes.STRING(80), allowNull: false },
        receivedAt: { type: DataTypes.DATE, allowNull: false },
      },
      { sequelize, tableName: 'payment_events', underscored: true, timestamps: false },
    );
  }
}

export function associateQuotes(EstimateModel: typeof Estimate): void {
  Quote.belongsTo(EstimateModel, { as: 'estimate', foreignKey: 'estimateId' });
  EstimateModel.hasMany(Quote, { as: 'quotes', foreignKey: 'estimateId' });
  Payment.belongsTo(Quote, { as: 'quote', foreignKey: 'quoteId' });
  Quote.hasMany(Payment, { as: 'payments', foreignKey: 'quoteId' });
}
