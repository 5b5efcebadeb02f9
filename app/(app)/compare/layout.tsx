import type { ReactNode } from "react";
import "./print.css";

export default function CompareLayout({ children }: { children: ReactNode }) {
  return children;
}
