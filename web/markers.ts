/** The temperature chart's markers: periastron passages, the maximum and the temperature window. */
import type uPlot from "uplot";
import type { chartMarkers } from "../src/view/chartData.js";
import { CHART_COLOURS } from "../src/view/palette.js";

/** Periastron lines, the maximum and the window, drawn on the temperature chart's canvas. */
export function markersPlugin(getMarkers: () => ReturnType<typeof chartMarkers> | null): uPlot.Plugin {
  return {
    hooks: {
      drawClear: [
        (u: uPlot) => {
          const m = getMarkers();
          if (!m?.window) return;
          const ctx = u.ctx;
          const top = u.valToPos(m.window.highK, "y", true);
          const bottom = u.valToPos(m.window.lowK, "y", true);
          const y0 = Math.max(u.bbox.top, Math.min(top, bottom));
          const y1 = Math.min(u.bbox.top + u.bbox.height, Math.max(top, bottom));
          if (y1 <= y0) return;
          ctx.save();
          ctx.fillStyle = "rgba(0, 158, 115, 0.13)";
          ctx.fillRect(u.bbox.left, y0, u.bbox.width, y1 - y0);
          ctx.restore();
        },
      ],
      draw: [
        (u: uPlot) => {
          const m = getMarkers();
          if (!m) return;
          const ctx = u.ctx;
          ctx.save();
          ctx.setLineDash([3 * devicePixelRatio, 5 * devicePixelRatio]);
          ctx.strokeStyle = CHART_COLOURS.grey;
          ctx.lineWidth = devicePixelRatio;
          for (const p of m.periastra) {
            const x = u.valToPos(p, "x", true);
            ctx.beginPath();
            ctx.moveTo(x, u.bbox.top);
            ctx.lineTo(x, u.bbox.top + u.bbox.height);
            ctx.stroke();
          }
          if (m.maximum) {
            const x = u.valToPos(m.maximum.x, "x", true);
            const y = u.valToPos(m.maximum.valueK, "y", true);
            ctx.setLineDash([]);
            ctx.fillStyle = CHART_COLOURS.marker;
            ctx.beginPath();
            ctx.arc(x, y, 5 * devicePixelRatio, 0, 2 * Math.PI);
            ctx.fill();
            ctx.font = `${12 * devicePixelRatio}px sans-serif`;
            ctx.fillText("max", x + 8 * devicePixelRatio, y - 6 * devicePixelRatio);
          }
          ctx.restore();
        },
      ],
    },
  };
}

