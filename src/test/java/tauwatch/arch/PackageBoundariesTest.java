package tauwatch.arch;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/** The part boundaries of DESIGN.md, checked on the compiled main classes. */
class PackageBoundariesTest {
  private static JavaClasses classes;

  @BeforeAll
  static void importClasses() {
    classes =
        new ClassFileImporter()
            .withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
            .importPackages("tauwatch");
  }

  @Test
  void onlyTheViewImportsJavaFx() {
    noClasses()
        .that()
        .resideOutsideOfPackage("tauwatch.view..")
        .should()
        .dependOnClassesThat()
        .resideInAPackage("javafx..")
        .check(classes);
  }

  @Test
  void fitAndHealthImportNeitherIoNorTheView() {
    noClasses()
        .that()
        .resideInAnyPackage("tauwatch.fit..", "tauwatch.health..")
        .should()
        .dependOnClassesThat()
        .resideInAnyPackage(
            "java.io..",
            "java.nio..",
            "java.net..",
            "com.fazecast..",
            "javafx..",
            "java.awt..",
            "tauwatch.view..",
            "tauwatch.source..",
            "tauwatch.wire..",
            "tauwatch.record..",
            "tauwatch.cli..")
        .check(classes);
  }

  @Test
  void theSimulatorDoesNotDependOnTheEstimators() {
    noClasses()
        .that()
        .resideInAPackage("tauwatch.sim..")
        .should()
        .dependOnClassesThat()
        .resideInAnyPackage("tauwatch.fit..", "tauwatch.health..", "tauwatch.pulse..")
        .check(classes);
  }

  @Test
  void pulseFindingDoesNotFit() {
    noClasses()
        .that()
        .resideInAPackage("tauwatch.pulse..")
        .should()
        .dependOnClassesThat()
        .resideInAnyPackage("tauwatch.fit..", "tauwatch.health..")
        .check(classes);
  }

  @Test
  void streamKnowsNoPhysicsAndSourcesKnowNoPulses() {
    noClasses()
        .that()
        .resideInAPackage("tauwatch.stream..")
        .should()
        .dependOnClassesThat()
        .resideInAnyPackage(
            "tauwatch.fit..", "tauwatch.pulse..", "tauwatch.health..", "tauwatch.sim..")
        .check(classes);
    noClasses()
        .that()
        .resideInAnyPackage("tauwatch.source..", "tauwatch.wire..")
        .should()
        .dependOnClassesThat()
        .resideInAnyPackage("tauwatch.pulse..", "tauwatch.fit..", "tauwatch.health..")
        .check(classes);
  }

  @Test
  void recordsComputeNoEstimatesAndNothingBelowTheCommandLineUsesIt() {
    noClasses()
        .that()
        .resideInAPackage("tauwatch.record..")
        .should()
        .dependOnClassesThat()
        .haveFullyQualifiedName("tauwatch.fit.VoltageClampEstimator")
        .check(classes);
    noClasses()
        .that()
        .resideOutsideOfPackage("tauwatch.cli..")
        .should()
        .dependOnClassesThat()
        .resideInAPackage("tauwatch.cli..")
        .check(classes);
  }

  @Test
  void theWireCodecStandsOnTheStreamAlone() {
    noClasses()
        .that()
        .resideInAPackage("tauwatch.wire..")
        .should()
        .dependOnClassesThat()
        .resideInAnyPackage(
            "tauwatch.source..",
            "tauwatch.record..",
            "tauwatch.monitor..",
            "tauwatch.sim..",
            "tauwatch.checkout..",
            "tauwatch.view..",
            "tauwatch.cli..")
        .check(classes);
  }

  @Test
  void theNaiveBaselineIsUsedByTheBenchmarksAlone() {
    noClasses()
        .that()
        .resideOutsideOfPackage("tauwatch.bench..")
        .should()
        .dependOnClassesThat()
        .resideInAPackage("tauwatch.bench.naive..")
        .check(classes);
  }
}
