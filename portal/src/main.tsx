import "@fontsource/manrope/400.css";
import "@fontsource/manrope/600.css";
import "@fontsource/manrope/700.css";
import "./index.css";
import { StrictMode } from "react";
import { createRoot } from "react-dom/client";
import { App } from "./app/provider";

const root = document.getElementById("root");
if (!root) throw new Error("Pendula: the page has no #root element.");

createRoot(root).render(
  <StrictMode>
    <App />
  </StrictMode>,
);
