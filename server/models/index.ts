import type { Sequelize } from 'sequelize';
import { AccountDocument, AccountEntry, AccountSetting } from './accounts';
import { AuditEntry } from './audit-entry';
import { associateEstimates, Customer, Estimate, EstimateRevision, Piece, PiecePhoto } from './estimates';
import { associateCatalog, FinishingSystem, LabourRate, Material, MaterialPack, PackPrice, Species } from './catalog';
import { PriceFilePreview } from './price-file-preview';
import { associatePlanning, Job, JobSession, MaterialStock, Polisher } from './planning';
import { JobEvent, JobNote, JobVariation } from './job-end';
import { associateStock, PurchaseOrder, PurchaseOrderLine, StockMovement } from './stock';
import { associateQuotes, OutboxMessage, Payment, PaymentEvent, Quote, QuoteLine } from './quotes';
import { User } from './user';
import { Workshop } from './workshop';

export { Customer, Estimate, EstimateRevision, Piece, PiecePhoto };
export { OutboxMessage, Payment, PaymentEvent, Quote, QuoteLine };
export { Job, JobSession, MaterialStock, Polisher };
export { JobEvent, JobNote, JobVariation };
export { PurchaseOrder, PurchaseOrderLine, StockMovement };
export { AccountDocument, AccountEntry, AccountSetting };
export { AuditEntry, FinishingSystem, LabourRate, Material, MaterialPack, PackPrice, PriceFilePreview, Species, User, Workshop };

let boundTo: Sequelize | undefined;

/** Binds every model to the connection (once per process: models are module-level classes). */
export function initModels(sequelize: Sequelize): void {
  if (boundTo === sequelize) return;
  if (boundTo) throw new Error('models are already bound to another connection');
  for (const model of [User, Workshop, AuditEntry, Species, FinishingSystem, Material, MaterialPack, PackPrice, LabourRate, PriceFilePreview, Customer, Piece, PiecePhoto, Estimate, EstimateRevision, Quote, QuoteLine, OutboxMessage, Payment, PaymentEvent, Polisher, Job, JobSession, MaterialStock, StockMovement, PurchaseOrder, PurchaseOrderLine, AccountDocument, AccountEntry, AccountSetting, JobNote, JobEvent, JobVariation]) {
    model.initModel(sequelize);
  }
  associateCatalog();
  associateEstimates(User);
  associateQuotes(Estimate);
  associatePlanning();
  associateStock();
  boundTo = sequelize;
}
