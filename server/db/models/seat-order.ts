import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

export type SeatOrderStatus = 'pending' | 'paid' | 'expired' | 'refunded' | 'partially_refunded';

/** An employer's order of exam seats, paid through a Checkout Session. */
export class SeatOrder extends Model<InferAttributes<SeatOrder>, InferCreationAttributes<SeatOrder>> {
  declare id: string;
  declare organizationId: number;
  declare createdBy: number | null;
  declare quantity: number;
  declare unitAmount: number;
  declare amountTotal: number;
  declare currency: string;
  declare status: CreationOptional<SeatOrderStatus>;
  declare checkoutSessionId: string | null;
  declare paymentIntentId: string | null;
  declare refundedQuantity: CreationOptional<number>;
  declare paidAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    SeatOrder.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true },
        organizationId: { type: DataTypes.INTEGER, allowNull: false },
        createdBy: { type: DataTypes.INTEGER, allowNull: true },
        quantity: { type: DataTypes.INTEGER, allowNull: false },
        unitAmount: { type: DataTypes.INTEGER, allowNull: false },
        amountTotal: { type: DataTypes.INTEGER, allowNull: false },
        currency: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.ENUM('pending', 'paid', 'expired', 'refunded', 'partially_refunded'), allowNull: false, defaultValue: 'pending' },
        checkoutSessionId: { type: DataTypes.TEXT, allowNull: true },
        paymentIntentId: { type: DataTypes.TEXT, allowNull: true },
        refundedQuantity: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        paidAt: { type: DataTypes.DATE, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'seat_orders', underscored: true },
    );
  }
}
