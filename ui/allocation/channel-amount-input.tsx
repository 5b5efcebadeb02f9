"use client";

import { AmountField } from "./amount-field";
import { useAllocation, useAllocationReadOnly, useAllocationStoreApi, useMoney, type AllocationComponentProps } from "./store-context";

export interface ChannelAmountInputProps extends AllocationComponentProps {
  channel: string;
  className?: string;
}

/** A channel's horizon amount as a typed number; commits through the same rules as the slider. */
export function ChannelAmountInput({ channel, className, store: storeProp, money: moneyProp }: ChannelAmountInputProps) {
  const store = useAllocationStoreApi(storeProp);
  const money = useMoney(storeProp, moneyProp);
  const row = useAllocation((state) => state.allocation.channels.find((c) => c.name === channel), storeProp);
  const readOnly = useAllocationReadOnly();
  if (!row) return null;
  return (
    <AmountField
      className={className}
      label={`${row.label} spend for the horizon`}
      valueCents={row.amountCents}
      locale={money.locale}
      currency={money.currency}
      disabled={row.locked || readOnly}
      onCommit={(cents) => {
        // The field never commits undefined here (allowEmpty is off); a clamp is explained by lastMessage.
        if (cents !== undefined) store.getState().move(channel, cents);
      }}
    />
  );
}
