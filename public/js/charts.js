// Draws every <canvas class="chart" data-chart="…"> with Chart.js. The server puts the
// whole chart configuration (series, axes, labels) in the data attribute as JSON; this
// script adds no numbers of its own. Pages stay readable without it (tables carry the data).
(function () {
  'use strict';
  function logTicks(value) {
    return Number.isInteger(value) ? '1e' + value : '';
  }
  function draw(canvas) {
    if (typeof window.Chart === 'undefined') return;
    var cfg;
    try {
      cfg = JSON.parse(canvas.getAttribute('data-chart'));
    } catch (e) {
      canvas.replaceWith(document.createTextNode('Chart data could not be read.'));
      return;
    }
    cfg.options = cfg.options || {};
    cfg.options.responsive = true;
    cfg.options.maintainAspectRatio = false;
    cfg.options.animation = false;
    var scales = cfg.options.scales || {};
    Object.keys(scales).forEach(function (k) {
      if (scales[k] && scales[k].decadeTicks) {
        delete scales[k].decadeTicks;
        scales[k].ticks = Object.assign({}, scales[k].ticks, { callback: logTicks });
      }
    });
    var chart = new window.Chart(canvas.getContext('2d'), cfg);
    canvas.setAttribute('data-drawn', 'true');
    canvas.chartInstance = chart;
  }
  function init() {
    var list = document.querySelectorAll('canvas.chart[data-chart]');
    for (var i = 0; i < list.length; i++) draw(list[i]);
    document.documentElement.setAttribute('data-charts-ready', String(list.length));
  }
  if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', init);
  else init();
})();
