/** The side pane inside Excel: the pane UI over the Office.js adapter. */
import { OfficeHost } from "./host/office";
import { mountPane } from "./ui";
import { workbookTab } from "./workbookTab";

Office.onReady((info) => {
  const root = document.getElementById("app")!;
  if (info.host !== Office.HostType.Excel) {
    root.textContent = "Nappe runs in Excel: open this pane from the Nappe button on Excel's Home tab.";
    return;
  }
  mountPane(root, new OfficeHost(), [workbookTab]);
});
