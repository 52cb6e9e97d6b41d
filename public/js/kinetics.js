// Kinetics page enhancement (optional: the form works without it). Shows only the inputs
// that apply to the current choices and selects the data source the user is working on.
(function () {
  'use strict';
  var form = document.getElementById('kinetics-form');
  if (!form) return;

  function value(name) {
    var checked = form.querySelector('input[name="' + name + '"]:checked');
    if (checked) return checked.value;
    var field = form.elements.namedItem(name);
    return field && 'value' in field ? field.value : '';
  }

  function update() {
    var blocks = form.querySelectorAll('[data-show-when]');
    for (var i = 0; i < blocks.length; i++) {
      var rule = blocks[i].getAttribute('data-show-when').split('=');
      blocks[i].hidden = value(rule[0]) !== rule[1];
    }
  }

  function pickSource(source) {
    var radio = form.querySelector('input[name="source"][value="' + source + '"]');
    if (radio && !radio.disabled) radio.checked = true;
  }

  form.addEventListener('change', function (event) {
    var t = event.target;
    if (t.name === 'dataset') pickSource('dataset');
    if (t.name === 'dataFile' && t.files && t.files.length) pickSource('file');
    update();
  });
  var paste = form.elements.namedItem('data');
  if (paste) {
    paste.addEventListener('input', function () {
      if (paste.value.trim() !== '') pickSource('paste');
    });
  }
  update();
})();
