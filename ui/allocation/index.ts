/** Client components for the scenario's allocation panel (see AllocationPanel for the assembled form). */
export { AllocationPanel, type AllocationPanelProps } from "./allocation-panel";
export { AllocationStoreProvider, useAllocation, useAllocationReadOnly, useAllocationStoreApi, useMoney, type AllocationComponentProps } from "./store-context";
export { ChannelRow, type ChannelRowProps } from "./channel-row";
export { ChannelSlider, type ChannelSliderProps } from "./channel-slider";
export { ChannelAmountInput, type ChannelAmountInputProps } from "./channel-amount-input";
export { AmountField, type AmountFieldProps } from "./amount-field";
export { LockToggle, type LockToggleProps } from "./lock-toggle";
export { BoundsDisclosure, type BoundsDisclosureProps } from "./bounds-disclosure";
export { ObservedRangeStrip, type ObservedRangeStripProps } from "./observed-range-strip";
export { ModeSwitch } from "./mode-switch";
export { TotalDisplay, type TotalDisplayProps } from "./total-display";
export { UndoRedoButtons, useUndoRedoShortcuts } from "./undo-redo";
export { sliderMaxCents, dragStepCents, keyboardDelta } from "./slider-scale";
