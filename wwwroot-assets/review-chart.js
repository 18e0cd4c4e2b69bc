// Review timeline: renders an ECharts option object built on the server (OpsLvp.Web.Review.TimelineChartOptions).
window.opslvpReview = {
    render: function (elementId, optionJson) {
        var el = document.getElementById(elementId);
        if (!el || !window.echarts) {
            return false;
        }
        var chart = window.echarts.getInstanceByDom(el) || window.echarts.init(el, null, { renderer: 'canvas' });
        chart.setOption(JSON.parse(optionJson), { notMerge: true });
        if (!el.dataset.resizeHooked) {
            el.dataset.resizeHooked = '1';
            window.addEventListener('resize', function () { chart.resize(); });
            window.addEventListener('beforeprint', function () { chart.resize({ width: 1050 }); });
            window.addEventListener('afterprint', function () { chart.resize(); });
        }
        el.dataset.rendered = '1';
        return true;
    }
};
