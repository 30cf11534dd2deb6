import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { DocumentKind, EntryKind, InvoiceStage, PaymentMethod } from '@shared/schemas/accounts';

/** What an account document prints, as issued (see server/pdf/account-pdf.ts). */
export interface DocumentContent {
  kind: DocumentKind;
  number: string;
  issuedOn: string;
  paperSize: 'A4' | 'Letter';
  workshop: { name: string; address: string | null; email: string | null; phone: string | null };
  customer: { name: string; address: string | null; email: string | null };
  quoteNumber: string;
  jobNumbers: string[];
  currency: string;
  /** The work and extras charged (invoice), the payment acknowledged (receipt), or what is credited (credit note). */
  lines: { description: string; note?: string; amount: string }[];
  total: string;
  net: string;
  tax: string;
  taxLabel: string;
  taxPct: number;
  /** Payments and refunds taken into account, each with its date (invoice: deducted; receipt: the one received). */
  payments: { label: string; date: string; amount: string }[];
  credits: { number: string; date: string; amount: string }[];
  balanceDue: string;
  /** The agreed total, the total received to date (receipt). */
  agreedTotal: string;
  receivedToDate: string;
  reason: string | null;
  againstNumber: string | null;
  refund: { method: string; amount: string } | null;
  note: string | null;
}

export class AccountDocument extends Model<InferAttributes<AccountDocument>, InferCreationAttributes<AccountDocument>> {
  declare id: CreationOptional<number>;
  declare workshopId: number;
  declare kind: DocumentKind;
  declare seq: number;
  declare number: string;
  declare quoteId: number;
  declare customerId: number;
  declare invoiceId: number | null;
  declare entryId: number | null;
  declare currency: string;
  declare total: string;
  declare net: string;
  declare tax: string;
  declare taxPct: string | number;
  declare taxLabel: string;
  declare balanceDue: string;
  declare reason: string | null;
  declare content: DocumentContent;
  declare issuedAt: Date;
  declare issuedBy: number | null;
  declare outboxId: number | null;

  static initModel(sequelize: Sequelize): void {
    AccountDocument.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        workshopId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(16), allowNull: false },
        seq: { type: DataTypes.INTEGER, allowNull: false },
        number: { type: DataTypes.STRING(20), allowNull: false },
        quoteId: { type: DataTypes.INTEGER, allowNull: false },
        customerId: { type: DataTypes.INTEGER, allowNull: false },
        invoiceId: { type: DataTypes.INTEGER, allowNull: true },
        entryId: { type: DataTypes.INTEGER, allowNull: true },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        total: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        net: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        tax: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        taxPct: { type: DataTypes.DECIMAL(5, 2), allowNull: false },
        taxLabel: { type: DataTypes.STRING(40), allowNull: false },
        balanceDue: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        reason: { type: DataTypes.TEXT, allowNull: true },
        content: { type: DataTypes.JSONB, allowNull: false },
        issuedAt: { type: DataTypes.DATE, allowNull: false },
        issuedBy: { type: DataTypes.INTEGER, allowNull: true },
        outboxId: { type: DataTypes.INTEGER, allowNull: true },
      },
      { sequelize, tableName: 'account_documents', underscored: true, timestamps: false },
    );
  }
}

/** One line of the payments ledger: a payment received or a refund made. */
export class AccountEntry extends Model<InferAttributes<AccountEntry>, InferCreationAttributes<AccountEntry>> {
  declare id: CreationOptional<number>;
  declare quoteId: number;
  declare kind: EntryKind;
  declare method: PaymentMethod;
  declare amount: string;
  declare currency: string;
  declare receivedOn: string;
  declare reference: string;
  declare note: string;
  declare paymentId: number | null;
  declare creditNoteId: number | null;
  declare recordedBy: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    AccountEntry.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        quoteId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(10), allowNull: false },
        method: { type: DataTypes.STRING(16), allowNull: false },
        amount: { type: DataTypes.DECIMAL(14, 2), allowNull: false },
        currency: { type: DataTypes.STRING(3), allowNull: false },
        receivedOn: { type: DataTypes.DATEONLY, allowNull: false },
        reference: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
        paymentId: { type: DataTypes.INTEGER, allowNull: true },
        creditNoteId: { type: DataTypes.INTEGER, allowNull: true },
        recordedBy: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'account_entries', underscored: true, updatedAt: false },
    );
  }
}

export class AccountSetting extends Model<InferAttributes<AccountSetting>, InferCreationAttributes<AccountSetting>> {
  declare workshopId: number;
  declare invoiceStage: InvoiceStage;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    AccountSetting.init(
      {
        workshopId: { type: DataTypes.INTEGER, primaryKey: true },
        invoiceStage: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'finished' },
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'account_settings', underscored: true, createdAt: false },
    );
  }
}
